/** A row (or a whole source) that did not make it into the store, and why: one line of rejected.csv. */
export interface Reject {
  source: string;
  /** 1-based line (text formats) or record number; 0 for a whole source. */
  line: number;
  field: string;
  reason: string;
}
