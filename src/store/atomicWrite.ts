import { closeSync, fsyncSync, openSync, renameSync, writeSync } from 'node:fs';
import { dirname } from 'node:path';

/** Writes all of `bytes` at the file's current position. */
export function writeAll(fd: number, bytes: Uint8Array): void {
  let off = 0;
  while (off < bytes.byteLength) off += writeSync(fd, bytes, off, bytes.byteLength - off);
}

/**
 * Writes a file beside its target, fsyncs it, renames it over the target and fsyncs the folder.
 * `data` may be a function that writes to the open file (streaming large content).
 */
export function atomicWrite(path: string, data: Uint8Array | string | ((fd: number) => void)): void {
  const tmp = `${path}.tmp-${process.pid}`;
  const fd = openSync(tmp, 'w');
  try {
    if (typeof data === 'function') data(fd);
    else writeAll(fd, typeof data === 'string' ? Buffer.from(data, 'utf8') : data);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
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
