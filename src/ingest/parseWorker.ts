import { parentPort } from 'node:worker_threads';
import { packTable, readSourceFile } from './readSourceFile.js';
import type { FileJob, FileOutcome, PackedTable } from './readSourceFile.js';

/** Worker thread: reads and normalises the files it is sent, posts results with tables packed. */
export type PackedOutcome = Omit<FileOutcome, 'norm'> & { norm?: Omit<Extract<FileOutcome, { kind: 'parsed' }>['norm'], 'table'> & { table: PackedTable } };

parentPort?.on('message', (msg: { id: number; jobs: FileJob[] }) => {
  const outs: PackedOutcome[] = [];
  const transfer: ArrayBuffer[] = [];
  for (const job of msg.jobs) {
    const o = readSourceFile(job);
    if (o.kind === 'parsed') {
      const { packed, transfer: t } = packTable(o.norm.table);
      transfer.push(...t);
      outs.push({ ...o, norm: { ...o.norm, table: packed } } as PackedOutcome);
    } else outs.push(o as PackedOutcome);
  }
  parentPort!.postMessage({ id: msg.id, outs }, transfer);
});
