import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from './demoStore.js';
import { typeCheck } from './typeCheck.js';


describe('type declarations of the package', () => {
  it('a script using every exported function type-checks against dist/*.d.ts through "exports"', () => {
    const r = typeCheck(join(ROOT, 'test/api/types/tsconfig.json'));
    // usage.ts also holds @ts-expect-error lines: an `any` type there would fail the check.
    expect(r.output).toBe('');
    expect(r.code).toBe(0);
  });

  it('a wrong use of an exported value is a type error (the check can fail)', () => {
    const work = mkdtempSync(join(ROOT, '.api-work-'));
    try {
      const text = `const wrong: string = (await import('descent-atlas')).MAP_FORMAT.length;\nexport { wrong };\n`;
      writeFileSync(join(work, 'wrong.ts'), text);
      writeFileSync(join(work, 'tsconfig.json'), JSON.stringify({ extends: '../tsconfig.json', compilerOptions: { noEmit: true, rootDir: '.' }, include: ['wrong.ts'], exclude: [] }));
      const r = typeCheck(join(work, 'tsconfig.json'));
      expect(r.code).not.toBe(0);
      expect(r.output).toMatch(/TS2322/);
    } finally {
      rmSync(work, { recursive: true, force: true });
    }
  });
});
