import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The package folder (holds package.json named descent-atlas), from src/, dist/src/ or dist/bundle/. */
export function packageRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const pkg = join(dir, 'package.json');
    if (existsSync(pkg) && /"name":\s*"descent-atlas"/.test(readFileSync(pkg, 'utf8'))) return dir;
    const up = dirname(dir);
    if (up === dir) return resolve(dirname(fileURLToPath(import.meta.url)), '../..');
    dir = up;
  }
}

/** The version in package.json ("unknown" when it cannot be read). */
export function packageVersion(): string {
  try {
    const v = (JSON.parse(readFileSync(join(packageRoot(), 'package.json'), 'utf8')) as { version?: unknown }).version;
    return typeof v === 'string' ? v : 'unknown';
  } catch {
    return 'unknown';
  }
}
