import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';

/** The folder of an installed package (its exports map hides package.json and build/, so walk up from the entry). */
function packageDir(name: string): string {
  const require = createRequire(import.meta.url);
  let dir = dirname(require.resolve(name));
  while (!existsSync(join(dir, 'package.json')) || JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8')).name !== name) {
    const up = dirname(dir);
    if (up === dir) throw new Error(`cannot find the folder of package ${name}`);
    dir = up;
  }
  return dir;
}

/** The browser builds of vega and vega-lite from node_modules, for inlining in the HTML report. */
export function readRuntime(): { vega: string; vegaLite: string } {
  return {
    vega: readFileSync(join(packageDir('vega'), 'build/vega.min.js'), 'utf8'),
    vegaLite: readFileSync(join(packageDir('vega-lite'), 'build/vega-lite.min.js'), 'utf8'),
  };
}
