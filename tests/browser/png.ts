/**
 * Shrinks a browser screenshot for the docs: RGB PNG in, palette PNG out (at most 256 colours).
 * A page of text and flat charts holds a few hundred colours at most apart from anti-aliasing
 * shades, so the most frequent 256 colours, with every other pixel mapped to its nearest one,
 * look the same and take about half the bytes. No image library is needed for so small a job.
 */

import { deflateSync, inflateSync } from 'node:zlib';

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (const b of buf) c = CRC_TABLE[(c ^ b) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, 'ascii');
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), data])), 0);
  return Buffer.concat([head, data, crc]);
}

/** Decodes an 8-bit RGB or RGBA PNG (as Chromium writes them) to packed RGB pixels. */
function decode(png: Buffer): { width: number; height: number; rgb: Buffer } {
  let off = 8;
  let width = 0;
  let height = 0;
  let channels = 3;
  const idat: Buffer[] = [];
  while (off < png.length) {
    const len = png.readUInt32BE(off);
    const type = png.toString('ascii', off + 4, off + 8);
    const data = png.subarray(off + 8, off + 8 + len);
    if (type === 'IHDR') {
      width = data.readUInt32BE(0);
      height = data.readUInt32BE(4);
      if (data[8] !== 8 || (data[9] !== 2 && data[9] !== 6) || data[12] !== 0) throw new Error('only 8-bit, non-interlaced RGB(A) PNGs');
      channels = data[9] === 6 ? 4 : 3;
    } else if (type === 'IDAT') idat.push(data);
    off += 12 + len;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const px = Buffer.alloc(height * stride);
  let prev = Buffer.alloc(stride);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)]!;
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    const cur = px.subarray(y * stride, (y + 1) * stride);
    for (let i = 0; i < stride; i++) {
      const a = i >= channels ? cur[i - channels]! : 0;
      const b = prev[i]!;
      const c = i >= channels ? prev[i - channels]! : 0;
      let v = line[i]!;
      if (filter === 1) v += a;
      else if (filter === 2) v += b;
      else if (filter === 3) v += (a + b) >> 1;
      else if (filter === 4) {
        const p = a + b - c;
        const pa = Math.abs(p - a);
        const pb = Math.abs(p - b);
        const pc = Math.abs(p - c);
        v += pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
      }
      cur[i] = v & 0xff;
    }
    prev = cur;
  }
  if (channels === 3) return { width, height, rgb: px };
  const rgb = Buffer.alloc(width * height * 3);
  for (let i = 0, j = 0; i < px.length; i += 4, j += 3) px.copy(rgb, j, i, i + 3);
  return { width, height, rgb };
}

export function palettePng(png: Buffer): Buffer {
  const { width, height, rgb } = decode(png);
  const freq = new Map<number, number>();
  for (let i = 0; i < rgb.length; i += 3) {
    const k = (rgb[i]! << 16) | (rgb[i + 1]! << 8) | rgb[i + 2]!;
    freq.set(k, (freq.get(k) ?? 0) + 1);
  }
  const palette = [...freq.entries()].sort((a, b) => b[1] - a[1] || a[0] - b[0]).slice(0, 256).map(([k]) => k);
  const index = new Map<number, number>();
  palette.forEach((k, i) => index.set(k, i));
  const nearest = (k: number): number => {
    let best = 0;
    let bestD = Infinity;
    const r = k >> 16;
    const g = (k >> 8) & 0xff;
    const b = k & 0xff;
    palette.forEach((p, i) => {
      const d = (r - (p >> 16)) ** 2 + (g - ((p >> 8) & 0xff)) ** 2 + (b - (p & 0xff)) ** 2;
      if (d < bestD) [best, bestD] = [i, d];
    });
    index.set(k, best);
    return best;
  };
  const raw = Buffer.alloc(height * (width + 1));
  for (let y = 0; y < height; y++) {
    raw[y * (width + 1)] = 0; // no filter: best for palette images
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 3;
      const k = (rgb[i]! << 16) | (rgb[i + 1]! << 8) | rgb[i + 2]!;
      raw[y * (width + 1) + 1 + x] = index.get(k) ?? nearest(k);
    }
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8;
  ihdr[9] = 3; // palette
  const plte = Buffer.alloc(palette.length * 3);
  palette.forEach((k, i) => {
    plte[i * 3] = k >> 16;
    plte[i * 3 + 1] = (k >> 8) & 0xff;
    plte[i * 3 + 2] = k & 0xff;
  });
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('PLTE', plte),
    chunk('IDAT', deflateSync(raw, { level: 9 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}
