import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { composeDeck } from '../../src/report/composeDeck.js';
import { renderSpec } from '../../src/render/renderSpec.js';
import { cellMapSpec } from '../../src/report/cellMapSpec.js';
import { modelMapFixture } from './fixtures.js';

// poppler-utils reads the PDF back as a viewer would (scripts/system-packages.txt installs it).
const hasPoppler = existsSync('/usr/bin/pdftotext') && existsSync('/usr/bin/pdfinfo');
const dir = mkdtempSync(join(tmpdir(), 'datlas-deck-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const run = (cmd: string, args: string[]) => spawnSync(cmd, args, { encoding: 'utf8' }).stdout;

describe.skipIf(!hasPoppler && !process.env.CI)('composeDeck', () => {
  it('writes 16:9 pages whose text can be selected and an embedded chart image', async () => {
    const { map, ridge } = modelMapFixture();
    const png = (await renderSpec(cellMapSpec(map, ridge), { format: 'png', scale: 1 })) as Buffer;
    const pdf = await composeDeck({
      footer: 'store abc123',
      pages: [
        { title: 'Fixture sweep <b>', subtitle: '102 runs', columns: [[{ kind: 'bullets', items: ['The peak sits at width 64 ≈ train size.'] }], [{ kind: 'table', columns: ['axis', 'values'], rows: [['width', '8 … 256']] }]] },
        { title: 'Model-wise map', columns: [[{ kind: 'image', png }, { kind: 'note', text: 'Peak inside seed noise at epoch 100.' }]] },
      ],
    });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const file = join(dir, 'deck.pdf');
    writeFileSync(file, pdf);
    const info = run('pdfinfo', [file]);
    expect(info).toMatch(/Pages:\s+2/);
    // 960 × 540 points is 16:9 (13.33 × 7.5 in, the common widescreen slide size).
    expect(info).toMatch(/Page size:\s+960 x 540 pts/);
    const text = run('pdftotext', ['-layout', file, '-']);
    expect(text).toContain('Fixture sweep <b>');
    expect(text).toContain('The peak sits at width 64 ≈ train size.');
    expect(text).toContain('Peak inside seed noise at epoch 100.');
    expect(text.replace(/\s+/g, '')).toContain('2/2');
    const images = run('pdfimages', ['-list', file]).trim().split('\n').slice(2);
    expect(images.length).toBe(1);
  });

  it('draws control characters of user text (run and condition names) as visible escapes', async () => {
    const evil = 'opt=\u001b[31mred\u001b]0;title\u0007';
    const pdf = await composeDeck({ pages: [{ title: `Sweep ${evil}`, columns: [[{ kind: 'bullets', items: [`condition ${evil}`] }], [{ kind: 'table', columns: ['run'], rows: [[`\u001b[2Jrun-1`]] }]] }] });
    const file = join(dir, 'escapes.pdf');
    writeFileSync(file, pdf);
    const text = run('pdftotext', ['-layout', file, '-']);
    expect(text).toContain('opt=\\u001b[31mred\\u001b]0;title\\u0007');
    expect(text).toContain('\\u001b[2Jrun-1');
    expect(text).not.toMatch(/[\u0000-\u0008\u000b\u000e-\u001f\u007f-\u009f]/);
  });

  it('cuts a table that does not fit and says how many rows are left out', async () => {
    const rows = Array.from({ length: 80 }, (_, i) => [String(i), `run-${i}`]);
    const pdf = await composeDeck({ pages: [{ title: 'Long table', columns: [[{ kind: 'table', columns: ['#', 'run'], rows }]] }] });
    const file = join(dir, 'long.pdf');
    writeFileSync(file, pdf);
    const text = run('pdftotext', ['-layout', file, '-']);
    const m = text.match(/… (\d+) more rows/);
    expect(m).not.toBeNull();
    const shown = rows.filter((r) => new RegExp(`\\brun-${r[0]}\\b`).test(text)).length;
    expect(shown + Number(m![1])).toBe(80);
  });

  it('wraps a long cell (the plan\'s "why") onto more lines instead of cutting it', async () => {
    const why = 'more data hurts from n 64 to 256 (width 256, noise 0.2) is borderline: p = 0.031, alpha 0.05; two more seeds settle it';
    const rows = [['seeds', '4', '0.41 s', 'label_noise 0.2 · width 256 · train_size 64, 256 · seeds 3, 4, 5, 6, 7, 8, 9, 10, 11, 12', why]];
    const pdf = await composeDeck({ pages: [{ title: 'Proposed next runs', columns: [[{ kind: 'table', columns: ['reason', 'runs', 'cost', 'which runs', 'why'], rows, size: 9.5 }]] }] });
    const file = join(dir, 'why.pdf');
    writeFileSync(file, pdf);
    const text = run('pdftotext', ['-raw', file, '-']);
    // Every word of the reason is on the page (over several lines), none replaced by an ellipsis.
    const flat = text.replace(/\s+/g, ' ');
    for (const word of why.split(' ')) expect(flat).toContain(word);
    expect(flat).toContain('settle it');
    expect(flat).not.toContain('…');
  });
});

describe('fitColumns', () => {
  it('keeps natural widths that fit and cuts only the widest columns to a common cap', async () => {
    const { fitColumns } = await import('../../src/report/composeDeck.js');
    expect(fitColumns([10, 20, 30], 100)).toEqual([10, 20, 30]);
    // 10 + 20 + 2·cap = 90 → cap 30: the two wide columns share what is left.
    expect(fitColumns([10, 20, 200, 300], 90)).toEqual([10, 20, 30, 30]);
    const w = fitColumns([5, 400, 7, 600], 300);
    expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(300, 9);
    expect(w[0]).toBe(5);
    expect(w[2]).toBe(7);
  });
});
