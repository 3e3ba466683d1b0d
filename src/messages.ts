/**
 * Every user-facing message in one place, so wording stays consistent and translatable.
 * Each stage has its own section; add entries at the end of your section.
 * Messages are functions of the facts they report, and name file, line and field where they apply.
 */

const fmtPath = (p: string) => (p === '-' ? 'stdin' : p);

// ── general / CLI ────────────────────────────────────────────────────────────
export const general = {
  unknownCommand: (name: string) => `unknown command '${name}'; run 'datlas --help' for the list`,
  internal: (what: string) => `internal error: ${what} (run again with --debug for details and report it)`,
  badAt: (text: string) => `--at expects axis=value (e.g. --at width=64), got '${text}'`,
  badList: (flag: string, text: string) => `${flag} expects a comma-separated list of numbers, got '${text}'`,
  wroteFile: (path: string) => `wrote ${fmtPath(path)}`,
};

// ── ingest ───────────────────────────────────────────────────────────────────

// ── store ────────────────────────────────────────────────────────────────────

// ── simulate ─────────────────────────────────────────────────────────────────

// ── cells / grid / map ───────────────────────────────────────────────────────

// ── analysis (ridge, threshold, hurts) ───────────────────────────────────────

// ── render ───────────────────────────────────────────────────────────────────
export const render = {
  title: (metric: string, kind: string, x: string, y: string) => `${metric}: ${kind} map over ${x} × ${y}`,
  slicesTitle: (metric: string, x: string, y: string) => `${metric} vs ${x} at chosen ${y}`,
  keyCells: (n: number) => `colour: mean over seeds in a measured cell (${n} cells)`,
  keyRaster: (method: string, rmse: string) =>
    `solid: measured cell · hatched: interpolated by ${method} (leave-one-out rmse ${rmse}), no run there`,
  keyMissing: (n: number) => `grey ×: missing cell, no finished run (${n})`,
  keyDiverged: (n: number) => `triangle: cell with diverged run(s), left out of the mean (${n})`,
  keyRidge: (from: string) => `ridge: error peak in each row; whiskers: its location interval (${from}); gap: no significant peak`,
  keyThreshold: (x: string, eps: string) => `dashed: interpolation threshold, smallest ${x} with mean train error ≤ ${eps}`,
  keySlicesBand: 'band: 95% Student-t interval over seeds · ◆ peak with its location interval · ▲ diverged run(s)',
  warnNoRidge: 'ridge not computed: no peak or threshold drawn',
  warnNoPeak: (k: number) => `no significant peak in any row (prominence ≥ ${k} standard errors): no ridge drawn`,
  warnWeakPeaks: (where: string, k: number) => `not significant (prominence < ${k} standard errors): peak at ${where}`,
  warnCurveNoise: (where: string) =>
    `one seed per cell: peak interval from curve noise, not seeds (${where}); run more seeds before trusting it`,
  badColors: (name: string, allowed: readonly string[]) =>
    `--colors '${name}' is not a perceptually uniform scheme; use one of ${allowed.join(', ')}`,
  badSlice: (text: string) => `--slices expects axis=v1,v2,... or v1,v2,... (values of the map's y axis), got '${text}'`,
  badSliceAxis: (axis: string, y: string) => `--slices names '${axis}' but this map's rows are ${y}`,
  badFacet: (name: string) => `--facet expects label_noise or condition, got '${name}'`,
  noCells: (kind: string) => `the ${kind} map has no measured cells: nothing to draw`,
};


// ── plan / coverage ──────────────────────────────────────────────────────────
export const plan = {
  specSyntax: (file: string, line: number, what: string) => `${fmtPath(file)} line ${line}: not valid YAML or JSON: ${what}`,
  specInvalid: (file: string, line: number | null, key: string, problem: string) =>
    `${fmtPath(file)}${line === null ? '' : ` line ${line}`}: ${key}: ${problem}`,
  specRequired: () => 'is required',
  specUnknownKey: (known: string[]) => `unknown key (expected one of: ${known.join(', ')})`,
  specLogNonPositive: () => 'log spacing needs values > 0 (use spacing: linear)',
  specMissing: (file: string) => `no spec file at ${fmtPath(file)} (write an example with: datlas plan --init ${file})`,
  specFlagNeeded: () => '--spec FILE is required (write an example with: datlas plan --init sweep.yaml)',
};

// ── report / demo ────────────────────────────────────────────────────────────
