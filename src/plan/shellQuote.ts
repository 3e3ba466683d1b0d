/**
 * Quotes a value as one POSIX shell word: left bare when it holds only characters no shell
 * treats specially, else single-quoted with each ' written as '\'' (POSIX.1-2017 Shell
 * Command Language §2.2.2: nothing inside single quotes is special).
 */
export function shellQuote(value: string): string {
  if (/^[A-Za-z0-9_@%+=:,./-]+$/.test(value)) return value;
  return `'${value.replace(/'/g, `'\\''`)}'`;
}
