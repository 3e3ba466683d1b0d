import { crc32, deflateSync } from 'node:zlib';

/**
 * Encodes 8-bit RGBA pixels (row-major, top row first) as a PNG (ISO/IEC 15948).
 * Pure and synchronous, so spec builders can embed images without a canvas.
 */
export function encodePng(rgba: Uint8Array, width: number, height: number): Buffer {
  if (rgba.length !== width * height * 4) throw new Error(`encodePng: ${rgba.length} bytes for ${width}×${height} RGBA`);
  const stride = width * 4;
  // Each scanline starts with its filter byte; "Sub" (1) compresses smooth colour ramps well.
  // A row equal to the one above gets "Up" (2): all zeros, which the buffer already holds (a map
  // of cells repeats each pixel row many times; filtering and deflating them was most of the cost).
  const raw = Buffer.alloc((stride + 1) * height);
  const px = Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength);
  for (let y = 0; y < height; y++) {
    const o = y * (stride + 1);
    const row = y * stride;
    if (y > 0 && px.compare(px, row - stride, row, row, row + stride) === 0) {
      raw[o] = 2;
      continue;
    }
    raw[o] = 1;
    for (let i = 0; i < stride; i++) {
      const left = i >= 4 ? rgba[row + i - 4] : 0;
      raw[o + 1 + i] = (rgba[row + i] - left) & 0xff;
    }
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type RGBA
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(raw, { level: 6 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

function chunk(type: string, data: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, 'latin1');
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), data])) >>> 0, 0);
  return Buffer.concat([head, data, crc]);
}

/** A PNG as a data URL, for an image mark. */
export function pngDataUrl(rgba: Uint8Array, width: number, height: number): string {
  return `data:image/png;base64,${encodePng(rgba, width, height).toString('base64')}`;
}
