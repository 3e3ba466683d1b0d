// The compiled CLI, always. bin/datlas switches to the TypeScript sources through tsx whenever a
// source is newer than dist/, which happens mid-bench while others edit src/; the bench builds
// dist/ right before each step, and this runs exactly what bin/datlas runs on a fresh build
// (including its freshness check, so start-up costs the same).
import { builtAt, newestSource } from '../scripts/freshness.mjs';
import { fileURLToPath } from 'node:url';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

const root = fileURLToPath(new URL('..', import.meta.url));
void (builtAt(root) >= newestSource(root));
// The bundle when the build made one (as bin/datlas); a checkout from before bundling has none.
const { main } = existsSync(join(root, 'dist/bundle/main.js')) ? await import('../dist/bundle/main.js') : await import('../dist/src/cli/main.js');
process.exitCode = await main(process.argv.slice(2));
