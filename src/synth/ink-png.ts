import { deflateSync } from 'node:zlib';

/**
 * A small 8-bit gray + alpha PNG, encoded synchronously (SVG pages are built as strings, so an <image> must be ready
 * without awaiting sharp). Chunk layout, colour type 4 and the CRC-32 polynomial are from the PNG specification
 * (W3C PNG, 2nd edition, sections 5.3, 11.2.2 and annex D).
 */
export function grayAlphaPng(width: number, height: number, gray: number, alpha: Uint8Array): Buffer {
  if (alpha.length !== width * height) throw new Error(`alpha has ${alpha.length} values for ${width}x${height}`);
  const raw = Buffer.alloc((width * 2 + 1) * height);
  const g = Math.max(0, Math.min(255, Math.round(gray)));
  for (let y = 0; y < height; y++) {
    const row = y * (width * 2 + 1); // filter byte 0 (none)
    for (let x = 0; x < width; x++) {
      raw[row + 1 + x * 2] = g;
      raw[row + 2 + x * 2] = alpha[y * width + x];
    }
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 4; // gray + alpha
  return Buffer.concat([
    Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(raw)),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

let table: Uint32Array | null = null;

function crc32(buf: Buffer): number {
  if (!table) {
    table = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      table[n] = c >>> 0;
    }
  }
  let crc = 0xffffffff;
  for (let i = 0; i < buf.length; i++) crc = table[(crc ^ buf[i]) & 0xff] ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}
