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

// ── plan / coverage ──────────────────────────────────────────────────────────

// ── report / demo ────────────────────────────────────────────────────────────
