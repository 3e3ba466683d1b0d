#!/usr/bin/env node
// Compiles src/ to dist/ when any source is newer than the last build, so `datlas` starts in
// a quarter of a second instead of compiling TypeScript on every call. bin/datlas falls back
// to running the sources through tsx when dist/ is stale, so a missed build is only slower.
// It also bundles the CLI into dist/bundle/ (esbuild, one ESM entry plus lazily imported chunks):
// loading a few files instead of hundreds of modules cuts start-up; bin/datlas prefers it.
import { execFileSync } from 'node:child_process';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { builtAt, newestSource } from './freshness.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const force = process.argv.includes('--force');
if (force || builtAt(root) < newestSource(root)) {
  const started = Date.now();
  try {
    execFileSync(process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', join(root, 'tsconfig.build.json')], { stdio: 'inherit' });
  } catch {
    // Type errors still emit JavaScript; `npm test` reports them through its own type check.
  }
  mkdirSync(join(root, 'dist'), { recursive: true });
  await bundle();
  writeFileSync(join(root, 'dist/.stamp'), String(started));
}

/**
 * dist/bundle/: main.js and the two worker-thread entries side by side (parseFiles and
 * parallelSweep find their worker as `./parseWorker.js` / `./sweepWorker.js` next to the code that
 * starts it, and chunks sit in the same folder). vega and vega-lite are bundled too, as chunks
 * loaded only by the commands that draw (their hundreds of small modules cost ~0.3 s to load one
 * by one); canvas (native), the Arrow readers and yaml stay external and load on use; the
 * commands stay separate chunks so `--help` loads none of them. Without esbuild
 * (a production install) or on a bundling error the bundle is removed and dist/src is used.
 */
/**
 * string-width (terminal width of text, used by yargs to lay out help) builds two Intl.Segmenter
 * objects and a dozen Unicode-property regular expressions when its module loads: ~30 ms of every
 * command's start-up, though only help text needs it. Its module body is wrapped into a function
 * run on the first call; the function and its results are unchanged. A module not of the expected
 * shape (one default-exported function) is bundled as it is.
 */
function lazyStringWidth() {
  return { name: 'lazy-string-width', setup: (build) => build.onLoad({ filter: /[\\/]string-width[\\/]index\.js$/ }, lazyModule) };
}

async function lazyModule(args) {
  const { readFile } = await import('node:fs/promises');
  const lines = (await readFile(args.path, 'utf8')).split('\n');
  const head = lines.filter((l) => /^import\s/.test(l));
  const body = lines.filter((l) => !/^import\s/.test(l));
  const exported = body.filter((l) => /^export\s/.test(l));
  if (exported.length !== 1 || !/^export default function stringWidth\(/.test(exported[0])) return undefined;
  const inner = body.map((l) => (l === exported[0] ? l.replace(/^export default /, '') : l)).join('\n');
  const contents = `${head.join('\n')}\nfunction init() {\n${inner}\nreturn stringWidth;\n}\nlet made;\nexport default function lazyStringWidth(string, options) {\n  return (made ??= init())(string, options);\n}\n`;
  return { contents, loader: 'js', resolveDir: dirname(args.path) };
}

async function bundle() {
  const out = join(root, 'dist/bundle');
  rmSync(out, { recursive: true, force: true });
  try {
    const { build } = await import('esbuild');
    await build({
      absWorkingDir: root,
      entryPoints: { main: 'src/cli/main.ts', parseWorker: 'src/ingest/parseWorker.ts', sweepWorker: 'src/simulate/sweepWorker.ts' },
      outdir: out,
      bundle: true,
      splitting: true,
      format: 'esm',
      platform: 'node',
      target: 'node20',
      chunkNames: 'chunk-[hash]',
      sourcemap: true,
      external: ['canvas', 'apache-arrow', '@uwdata/flechette', 'yaml', 'tsx', 'esbuild'],
      // Bundled CommonJS dependencies (cli-progress, @stdlib) call require() for Node built-ins.
      banner: { js: "import { createRequire as __datlasRequire } from 'node:module'; const require = __datlasRequire(import.meta.url);" },
      logLevel: 'error',
      plugins: [lazyStringWidth()],
    });
  } catch (err) {
    rmSync(out, { recursive: true, force: true });
    process.stderr.write(`build: no bundle (${err instanceof Error ? err.message.split('\n')[0] : String(err)}); dist/src is used\n`);
  }
}
