import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from './demoStore.js';

/** The fenced code block that follows the HTML comment `<!-- NAME ...-->` in README.md. */
export function readmeBlock(name: string): { lang: string; code: string } {
  const text = readFileSync(join(ROOT, 'README.md'), 'utf8');
  const at = text.indexOf(`<!-- ${name}`);
  if (at < 0) throw new Error(`README.md has no <!-- ${name} --> block`);
  const m = /```(\w+)\n([\s\S]*?)```/.exec(text.slice(at));
  if (!m) throw new Error(`README.md: no code block after <!-- ${name} -->`);
  return { lang: m[1], code: m[2] };
}
