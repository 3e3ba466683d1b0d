import { describe, expect, it } from 'vitest';
import { parseSpec } from '../../src/plan/parseSpec.js';
import { SPEC_EXAMPLE } from '../../src/plan/specExample.js';
import { specRuns } from '../../src/plan/SweepSpec.js';
import { UserError } from '../../src/UserError.js';

const fail = (text: string) => {
  try {
    parseSpec(text, 'sweep.yaml');
  } catch (e) {
    expect(e).toBeInstanceOf(UserError);
    return (e as Error).message;
  }
  throw new Error('expected a failure');
};

describe('parseSpec', () => {
  it('reads the DESIGN.md §6 JSON example', () => {
    const s = parseSpec('{"axes": {"width": [4, 8, 16], "train_size": [1000, 4000], "label_noise": [0, 0.2]}, "seeds": 3, "epochs": 4000}', 'spec.json');
    expect(s.axes).toEqual({ width: [4, 8, 16], train_size: [1000, 4000], label_noise: [0, 0.2] });
    expect(s.seeds).toEqual([0, 1, 2]);
    expect(s.epochs).toBe(4000);
    expect(s.conditions).toEqual(['']);
    expect(specRuns(s)).toHaveLength(3 * 2 * 2 * 3);
  });

  it('expands log and linear generators and the --init example', () => {
    const s = parseSpec(SPEC_EXAMPLE, 'sweep.yaml');
    expect(s.axes.width).toEqual([4, 8, 16, 32, 64, 128, 256]);
    expect(s.axes.label_noise).toEqual([0, 0.1, 0.2]);
    expect(s.conditions).toEqual(['adam']);
    const t = parseSpec(
      'axes:\n  width: {from: 1, to: 1000, count: 4}\n  train_size: [10]\n  label_noise: {from: 0, to: 0.3, count: 4}\nseeds: [1, 5]\nepochs: 10\n',
      's.yaml',
    );
    expect(t.axes.width).toEqual([1, 10, 100, 1000]);
    // 0.1 * 3 is 0.30000000000000004 in binary floating point; the generator rounds it away.
    expect(t.axes.label_noise).toEqual([0, 0.1, 0.2, 0.3]);
    expect(t.seeds).toEqual([1, 5]);
    const f = parseSpec('axes:\n  width: {from: 0.5, to: 2, count: 3, spacing: log}\n  train_size: [10]\nseeds: 1\nepochs: 1\n', 's.yaml');
    expect(f.axes.width).toEqual([0.5, 1, 2]);
  });

  it('spells conditions as the store does', () => {
    const s = parseSpec('axes:\n  width: [4]\n  train_size: [10]\nconditions: [sgd, {weight_decay: 0.0005, optimizer: adam}, 0.1]\nseeds: 1\nepochs: 1\n', 's.yaml');
    // Ingest joins config keys sorted by name as key=value with commas (src/ingest/normalizeRaw.ts formatCondition).
    expect(s.conditions).toEqual(['sgd', 'optimizer=adam,weight_decay=0.0005', '0.1']);
  });

  it('names file, line and key of the first problem', () => {
    expect(fail('axes:\n  width: {from: 4, to: 8}\n  train_size: [10]\nseeds: 2\nepochs: 5\n')).toBe('sweep.yaml line 2: axes.width.count: is required');
    expect(fail('axes:\n  width: [4, 8]\n  train_size: [10]\n  depth: 3\nseeds: 2\nepochs: 5\n')).toBe(
      "sweep.yaml line 4: unknown key 'depth' in axes (expected one of: width, train_size, label_noise)",
    );
    expect(fail('axes:\n  width: [4, -8]\n  train_size: [10]\nseeds: 2\nepochs: 5\n')).toBe('sweep.yaml line 2: axes.width[1]: must be > 0');
    expect(fail('axes:\n  width: [4]\n  train_size: [10]\n  label_noise: [0, 1.5]\nseeds: 2\nepochs: 5\n')).toMatch(/^sweep.yaml line 4: axes.label_noise\[1\]: must be <= 1/);
    expect(fail('axes:\n  width: [4]\n  train_size: [10]\n  label_noise: {from: 0, to: 0.2, count: 3, spacing: log}\nseeds: 2\nepochs: 5\n')).toBe(
      'sweep.yaml line 4: axes.label_noise.from: log spacing needs values > 0 (use spacing: linear)',
    );
    expect(fail('axes:\n  width: [4]\n  train_size: [10]\nseeds: 2\n')).toBe('sweep.yaml line 1: epochs: is required');
    expect(fail('axes:\n  width: [4]\n  train_size: [10]\nseeds: 2.5\nepochs: 3\n')).toMatch(/^sweep.yaml line 4: seeds: /);
    expect(fail('axes: [\n')).toMatch(/^sweep.yaml line \d+: not valid YAML or JSON/);
    expect(fail('{"axes": {"width": [4], "train_size": [10.5]}, "seeds": 2, "epochs": 5}')).toBe('sweep.yaml line 1: axes.train_size[0]: must be integer');
  });

  it('a misspelt key is an unknown key on its own line, with the nearest known key, at every level (ajv error paths)', () => {
    const spec = (lines: string[]) => `${lines.join('\n')}\n`;
    const base = ['# grid spec', 'name: demo', 'axes:', '  width: [4, 8]', '  train_size: [10]', '  label_noise: [0]', 'epochs: 5', 'seeds: 3'];
    // The misspelt key replaces a required one: reported as unknown (line 8), not as "seeds is required".
    expect(fail(spec([...base.slice(0, 7), 'sedes: 3']))).toBe("sweep.yaml line 8: unknown key 'sedes' (did you mean seeds?)");
    expect(fail(spec(['nmae: demo', ...base.slice(2)]))).toBe("sweep.yaml line 1: unknown key 'nmae' (did you mean name?)");
    expect(fail(spec(['axis:', ...base.slice(3)]))).toBe("sweep.yaml line 1: unknown key 'axis' (did you mean axes?)");
    expect(fail(spec([...base.slice(0, 3), '  widht: [4, 8]', ...base.slice(4)]))).toBe("sweep.yaml line 4: unknown key 'widht' in axes (did you mean width?)");
    expect(fail(spec([...base.slice(0, 4), '  train_szie: [10]', ...base.slice(5)]))).toBe("sweep.yaml line 5: unknown key 'train_szie' in axes (did you mean train_size?)");
    expect(fail(spec([...base.slice(0, 5), '  label_nosie: [0]', ...base.slice(6)]))).toBe("sweep.yaml line 6: unknown key 'label_nosie' in axes (did you mean label_noise?)");
    expect(fail(spec([...base.slice(0, 6), 'epoch: 5', 'seeds: 3']))).toBe("sweep.yaml line 7: unknown key 'epoch' (did you mean epochs?)");
    expect(fail(spec([...base.slice(0, 7), 'seeds: 3', 'condtions: [adam]']))).toBe("sweep.yaml line 9: unknown key 'condtions' (did you mean conditions?)");
    // Inside an axis generator: from, to, count, spacing, round.
    const gen = (g: string) => spec([...base.slice(0, 3), '  width:', `    ${g}`, ...base.slice(4)]);
    expect(fail(gen('{from: 4, to: 64, cuont: 5}'))).toBe("sweep.yaml line 5: unknown key 'cuont' in axes.width (did you mean count?)");
    expect(fail(gen('{from: 4, to: 64, count: 5, spacnig: log}'))).toBe("sweep.yaml line 5: unknown key 'spacnig' in axes.width (did you mean spacing?)");
    expect(fail(gen('{form: 4, to: 64, count: 5}'))).toBe("sweep.yaml line 5: unknown key 'form' in axes.width (did you mean from?)");
    expect(fail(gen('{from: 4, to: 64, count: 5, rond: true}'))).toBe("sweep.yaml line 5: unknown key 'rond' in axes.width (did you mean round?)");
    // Nothing near: the known keys are listed.
    expect(fail(spec([...base, 'colour: red']))).toBe("sweep.yaml line 9: unknown key 'colour' (expected one of: name, axes, conditions, seeds, epochs)");
    // JSON too (JSON is YAML 1.2): the line of the key.
    expect(fail('{"axes": {"width": [4], "train_size": [10]},\n "sedes": 2, "epochs": 5}')).toBe("sweep.yaml line 2: unknown key 'sedes' (did you mean seeds?)");
  });
});
