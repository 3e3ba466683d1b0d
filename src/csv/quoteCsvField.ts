/** RFC 4180 §2 rules 6–7: a field holding a comma, double quote, CR or LF is quoted, quotes doubled. */
export function quoteCsvField(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
