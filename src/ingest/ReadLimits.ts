/**
 * Bounds on what one line of a log may hold, checked while it is scanned: memory stays bounded
 * by design (a line of 200 MB, a header of millions of fields, a 200 MB run name are refused at
 * once with a message naming the limit), never by how much memory the machine happens to have.
 * Lengths are in characters (UTF-16 code units, as JavaScript counts them).
 */
export interface ReadLimits {
  /** Characters in one line (one record of CSV/TSV/text/JSON Lines); a longer one is rejected. */
  maxLine: number;
  /** Fields in one line (or keys in one JSON record); a header over it refuses the file. */
  maxFields: number;
  /** Characters in one text field (a run name, a condition value, a column name). */
  maxText: number;
}

/**
 * Generous for real sweep logs (the widest seen are a few thousand per-class metrics; run names
 * and configuration strings are well under a kilobyte), small enough that the worst line costs
 * a few hundred MB at most. Overridden by `ingest --max-line/--max-fields/--max-text`.
 */
export const DEFAULT_LIMITS: Readonly<ReadLimits> = { maxLine: 8 * 1024 * 1024, maxFields: 10_000, maxText: 64 * 1024 };

/** Levels of nesting a JSON value may have (objects and arrays inside one another). */
export const MAX_DEPTH = 64;

/**
 * Plausible ranges of the sweep axes: far beyond any model (about 1e13 parameters at most today),
 * data set or training run, yet small enough that the map's arithmetic (log2 of the axis, cell
 * edges, the cost model's width^a · n · epochs) stays finite. A value outside is a unit mix-up or
 * a corrupt log, rejected with the range (1e308 or 5e-324 as a width used to overflow the map).
 */
export const AXIS_RANGE = { width: [1e-9, 1e15], epochs: [0, 1e12], train_size: [1, 1e15] } as const satisfies Record<string, readonly [number, number]>;
