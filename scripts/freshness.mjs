// Whether dist/ is at least as new as every file under src/ (shared by bin/datlas and the build).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';

export function newestSource(root) {
  // One recursive listing (Node 20.1+) and a stat per file: every command pays for this check.
  let newest = 0;
  for (const e of readdirSync(join(root, 'src'), { withFileTypes: true, recursive: true })) {
    if (e.isDirectory()) continue;
    const m = statSync(`${e.parentPath ?? e.path}/${e.name}`).mtimeMs;
    if (m > newest) newest = m;
  }
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
