import { describe, expect, it } from 'vitest';
import { execFileSync, spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readSourceFile } from '../../src/ingest/readSourceFile.js';

const options = { map: {}, set: {}, scale: {}, seedFrom: null };

describe('readSourceFile', () => {
  it('reads every byte of a source that grows while it is read (a pipe fed by another process)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'datlas-read-'));
    try {
      // 6,000 rows, ~150 KB: more than the first read buffer, and the pipe's size is 0 at the start.
      const rows = Array.from({ length: 6000 }, (_, i) => `64,1000,0,${i + 1},0.${String(i % 1000).padStart(3, '0')}`);
      const csv = `width,train_size,seed,epoch,test_error\n${rows.join('\n')}\n`;
      const file = join(dir, 'log.csv');
      writeFileSync(join(dir, 'content'), csv);
      const fifo = join(dir, 'pipe.csv');
      execFileSync('mkfifo', [fifo]);
      const writer = spawn('sh', ['-c', `cat "${join(dir, 'content')}" > "${fifo}"`]);
      const piped = readSourceFile({ given: fifo, mtime: 0, options });
      writer.kill();
      writeFileSync(file, csv);
      const whole = readSourceFile({ given: file, mtime: 0, options });
      expect(piped.kind).toBe('parsed');
      if (piped.kind !== 'parsed' || whole.kind !== 'parsed') return;
      expect(piped.stamp.size).toBe(Buffer.byteLength(csv));
      expect(piped.stamp.sha256).toBe(whole.stamp.sha256);
      expect(piped.norm.table.length).toBe(6000);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
