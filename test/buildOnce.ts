// vitest globalSetup: brings dist/ up to date once, before any test file runs. The CLI tests spawn
// bin/datlas (fast only from a fresh dist/), and the library tests import the package through
// package.json "exports" (dist/src/api, with its declarations); building here, once, keeps test
// files from rebuilding dist/ under each other's feet. A no-op when dist/ is fresh.
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export default function setup(): void {
  execFileSync(process.execPath, [fileURLToPath(new URL('../scripts/build.mjs', import.meta.url))], { stdio: 'inherit' });
}
