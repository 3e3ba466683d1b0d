// Python's json module writes NaN, Infinity and -Infinity, which JSON.parse refuses: quote them
// so they read as non-finite numbers (a diverged run's test error is often logged this way).
const BARE_NONFINITE = /([:[,]\s*)(-?Infinity|NaN)(?=\s*[,\]}])/g;

/** JSON.parse, also taking the bare NaN / Infinity / -Infinity that Python writes (as strings). */
export function parseJsonLenient(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (err) {
    if (!/NaN|Infinity/.test(text)) throw err;
    return JSON.parse(text.replace(BARE_NONFINITE, '$1"$2"'));
  }
}

/** JSON.parse's reason without the echo of the input (which can be a whole huge line). */
export function jsonWhy(err: unknown): string {
  const m = (err as Error).message.split('\n')[0];
  return m.replace(/^(Unexpected token .*?), ".*$/, '$1').replace(/ in JSON at position \d+.*$/, '').slice(0, 120);
}
