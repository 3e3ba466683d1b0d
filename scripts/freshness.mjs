// Whether dist/ is at least as new as every file under src/ (shared by bin/datlas and the build).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';

export function newestSource(root) {
  let newest = 0;
  const walk = (dir) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      const p = join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else newest = Math.max(newest, statSync(p).mtimeMs);
    }
  };
  walk(join(root, 'src'));
  return newest;
}

/** The time the last build started (ms), or 0 when there is none. */
export function builtAt(root) {
  try {
    return Number(readFileSync(join(root, 'dist/.stamp'), 'utf8')) || 0;
  } catch {
    return 0;
  }
}
