/**
 * Tables written whole as one JSON object (pandas `to_json` orients and their like):
 * `split` `{"columns": [...], "index": [...], "data": [[...]]}`, `columns` `{"col": {"0": v}}`,
 * `index` `{"0": {"col": v}}` and `table` `{"schema": {...}, "data": [records]}`.
 */
const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);
const isScalar = (x: unknown) => x === null || typeof x !== 'object';

export interface SplitTable {
  columns: string[];
  index: unknown[] | null;
  data: unknown[][];
}

/** `orient="split"`. */
export function splitTable(obj: Record<string, unknown>): SplitTable | null {
  const keys = Object.keys(obj);
  if (!keys.includes('columns') || !keys.includes('data') || !keys.every((k) => k === 'columns' || k === 'data' || k === 'index')) return null;
  const { columns, data, index } = obj;
  if (!Array.isArray(columns) || !columns.every((c) => typeof c === 'string' || typeof c === 'number')) return null;
  if (!Array.isArray(data) || !data.every((r) => Array.isArray(r))) return null;
  return { columns: columns.map(String), index: Array.isArray(index) && index.length === data.length ? index : null, data: data as unknown[][] };
}

/** Scalar-only objects sharing one key set (the rows or columns of a transposed table). */
function sameScalarObjects(values: unknown[]): string[] | null {
  if (values.length === 0) return null;
  let keys: string[] | null = null;
  for (const v of values) {
    if (!isRecord(v)) return null;
    const ks = Object.keys(v);
    for (const k of ks) if (!isScalar(v[k])) return null;
    if (keys === null) keys = ks;
    else if (ks.length !== keys.length || !ks.every((k, i) => k === keys![i])) return null;
  }
  return keys;
}

const isIndexKeys = (keys: string[]) => keys.length > 0 && keys.every((k, i) => k === String(i));

/**
 * `orient="columns"`: column name → {row index → value}, the row indexes 0..n-1 in every column,
 * the column names not numbers. Rows come back as records.
 */
export function columnsTable(obj: Record<string, unknown>): Record<string, unknown>[] | null {
  const names = Object.keys(obj);
  if (names.length < 2 || names.some((n) => /^\d+$/.test(n))) return null;
  const index = sameScalarObjects(names.map((n) => obj[n]));
  if (!index || !isIndexKeys(index)) return null;
  return index.map((i) => Object.fromEntries(names.map((n) => [n, (obj[n] as Record<string, unknown>)[i]])));
}

/** `orient="index"` with a default index: keys 0..n-1, each a flat record of one key set. */
export function indexTable(obj: Record<string, unknown>): Record<string, unknown>[] | null {
  const keys = Object.keys(obj);
  if (keys.length < 2 || !isIndexKeys(keys)) return null;
  if (!sameScalarObjects(keys.map((k) => obj[k]))) return null;
  return keys.map((k) => obj[k] as Record<string, unknown>);
}

/** `orient="table"`: the schema says which fields there are; the records are under `data`. */
export function tableOrient(obj: Record<string, unknown>): unknown[] | null {
  const s = obj.schema;
  if (!isRecord(s) || !Array.isArray(s.fields) || !Array.isArray(obj.data) || Object.keys(obj).length !== 2) return null;
  return obj.data;
}
