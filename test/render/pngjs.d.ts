// pngjs ships no types; the tests use only its synchronous reader and writer.
declare module 'pngjs' {
  export interface PNGData {
    width: number;
    height: number;
    data: Buffer;
  }
  export const PNG: {
    new (opts: { width: number; height: number }): PNGData;
    sync: { read(buf: Buffer): PNGData; write(png: PNGData): Buffer };
  };
}
