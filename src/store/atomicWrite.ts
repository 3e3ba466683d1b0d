import { closeSync, fsyncSync, openSync, renameSync, writeSync } from 'node:fs';
import { dirname } from 'node:path';

/** Writes all of `bytes` at the file's current position. */
export function writeAll(fd: number, bytes: Uint8Array): void {
  let off = 0;
  while (off < bytes.byteLength) off += writeSync(fd, bytes, off, bytes.byteLength - off);
}

/** File content: bytes, text, or a function that writes to the open file (streaming large content). */
export type FileData = Uint8Array | string | ((fd: number) => void);

/** Writes `data` to `path` (created or truncated) and fsyncs it before closing. */
export function writeSynced(path: string, data: FileData): void {
  const fd = openSync(path, 'w');
  try {
    if (typeof data === 'function') data(fd);
    else writeAll(fd, typeof data === 'string' ? Buffer.from(data, 'utf8') : data);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/** Writes a file beside its target, fsyncs it, renames it over the target and fsyncs the folder. */
export function atomicWrite(path: string, data: FileData): void {
  const tmp = `${path}.tmp-${process.pid}`;
  writeSynced(tmp, data);
  renameSync(tmp, path);
  try {
    const dfd = openSync(dirname(path), 'r');
    try {
      fsyncSync(dfd);
    } finally {
      closeSync(dfd);
    }
  } catch {
    // Some file systems cannot fsync a directory; the rename is still atomic.
  }
}
