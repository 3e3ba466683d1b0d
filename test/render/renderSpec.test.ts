import { describe, expect, it } from 'vitest';
import type { TopLevelSpec } from 'vega-lite';
import { compileSpec, renderSpec } from '../../src/render/renderSpec.js';

const bars: TopLevelSpec = {
  data: { values: [{ a: 'x', b: 1 }, { a: 'y', b: 2 }] },
  mark: 'bar',
  encoding: { x: { field: 'a', type: 'nominal' }, y: { field: 'b', type: 'quantitative', title: 'test error' } },
};

describe('renderSpec', () => {
  it('compiles a clean spec without warnings', async () => {
    expect((await compileSpec(bars)).warnings).toEqual([]);
  });

  it('collects warnings of a faulty spec', async () => {
    // A shape channel on bars is dropped by vega-lite with a warning.
    const bad = { ...bars, encoding: { ...bars.encoding, shape: { field: 'a', type: 'nominal' } } } as TopLevelSpec;
    expect((await compileSpec(bad)).warnings.length).toBeGreaterThan(0);
  });

  it('draws control characters of user text in titles as visible escapes (SVG stays valid XML)', async () => {
    // XML 1.0 §2.2: the Char production allows no C0 control other than tab, LF and CR.
    const spec = { ...bars, title: 'map at condition opt=\u001b[31mred\u0007' } as TopLevelSpec;
    const svg = (await renderSpec(spec, { format: 'svg' })) as string;
    expect(svg).toContain('opt=\\u001b[31mred\\u0007');
    expect(svg).not.toMatch(/[\u0000-\u0008\u000b\u000c\u000e-\u001f]/);
  });

  it('writes PNG, SVG and PDF with their format signatures', async () => {
    // PNG signature: ISO/IEC 15948 §5.2; PDF header: ISO 32000-1 §7.5.2.
    const png = (await renderSpec(bars, { format: 'png' })) as Buffer;
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    const svg = (await renderSpec(bars, { format: 'svg' })) as string;
    expect(svg).toMatch(/^<svg/);
    expect(svg).toContain('test error');
    const pdf = (await renderSpec(bars, { format: 'pdf' })) as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
  });
});
