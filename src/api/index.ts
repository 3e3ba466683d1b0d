/**
 * descent-atlas as a library: each function returns the object the matching `datlas` command
 * prints with --json (the CLI calls these same functions). Functions that read rows take a store
 * (openStore), an arquero table (store.toArquero() after any verbs) or a RowTable.
 */
export { ingest, ingestSummary } from './ingest.js';
export type { IngestOptions, IngestSummary } from './ingest.js';
export { openStore } from './openStore.js';
export { Store } from './Store.js';
export { describe } from './describe.js';
export type { DescribeResult } from './describe.js';
export { buildMap } from './buildMap.js';
export type { MapObject, MapOptions } from './buildMap.js';
export { mapSummary } from './mapSummary.js';
export type { MapSummary } from './mapSummary.js';
export { findRidge } from './findRidge.js';
export type { RidgeJson } from './findRidge.js';
export { findHurts } from './findHurts.js';
export type { HurtsOptions } from './findHurts.js';
export { coverage } from './coverage.js';
export type { CoverageJson } from './coverage.js';
export { planRuns } from './planRuns.js';
export type { PlanOptions } from './planRuns.js';
export { renderMap } from './renderMap.js';
export type { RenderMapOptions } from './renderMap.js';
export { simulate } from './simulate.js';
export type { SimulateOptions, SimulateSummary } from './simulate.js';
export { fromArquero, rowsOf } from './rowsOf.js';
export type { ArqueroTable, RowsInput } from './rowsOf.js';
export type { SpecInput } from './specOf.js';
export { ORIGIN_CODES, MAP_FORMAT } from '../grid/mapJson.js';
export { UserError } from '../UserError.js';
export type { RowTable, Metric } from '../store/RowTable.js';
export type { Manifest } from '../store/Manifest.js';
export type { SweepMap, MapKind, MethodName } from '../grid/SweepMap.js';
export type { RidgeResult, RidgeRow, Peak } from '../analysis/Ridge.js';
export type { HurtsResult, HurtsSegment } from '../analysis/Hurts.js';
export type { RidgeOptions } from '../analysis/findRidge.js';
