import { analysisText } from '../messages.js';
import { usageError } from '../UserError.js';

/** The multiple-testing correction across rows or slices, by its one printed name. */
export type Correction = 'benjamini-hochberg' | 'none';

/** Spellings accepted on the CLI and in the library: `bh` is short for `benjamini-hochberg`. */
export type CorrectionSpelling = Correction | 'bh';

export const CORRECTION_SPELLINGS: readonly CorrectionSpelling[] = ['benjamini-hochberg', 'bh', 'none'];

/** The printed name of a correction spelling (case-insensitive); a usage error for anything else. */
export function correctionName(text: string): Correction {
  const s = String(text).trim().toLowerCase();
  if (s === 'benjamini-hochberg' || s === 'bh') return 'benjamini-hochberg';
  if (s === 'none') return 'none';
  throw usageError(analysisText.badCorrection(String(text)));
}
