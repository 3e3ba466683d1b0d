// dist/ (what package.json "exports" points at) is built once before the tests by test/buildOnce.ts.
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { ROOT } from './demoStore.js';

/** tsc (the project's own TypeScript) on a tsconfig; its exit code and diagnostics. */
export function typeCheck(tsconfig: string): { code: number; output: string } {
  try {
    const out = execFileSync(process.execPath, [join(ROOT, 'node_modules/typescript/bin/tsc'), '-p', tsconfig], { encoding: 'utf8' });
    return { code: 0, output: out };
  } catch (err) {
    const e = err as { status?: number; stdout?: string; stderr?: string };
    return { code: e.status ?? 1, output: `${e.stdout ?? ''}${e.stderr ?? ''}` };
  }
}
