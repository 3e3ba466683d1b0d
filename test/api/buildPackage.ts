import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { ROOT } from './demoStore.js';

/** Brings dist/ (JavaScript and declarations, what package.json "exports" points at) up to date. */
export function buildPackage(): void {
  execFileSync(process.execPath, [join(ROOT, 'scripts/build.mjs')], { stdio: 'inherit' });
}

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
