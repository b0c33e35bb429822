/**
 * A small TIFF that declares many large one-bit white pages: every page's strip is the same PackBits data, stored
 * once (TIFF 6.0 §9 PackBits, rows packed separately; §8 baseline bilevel tags). The file is a few hundred KB while
 * its pages add up to billions of pixels, the shape of a decompression bomb.
 */
export function whiteTiffPages(pages: number, width: number, height: number): Buffer {
  const rowBytes = Math.ceil(width / 8);
  const runs: number[] = [];
  for (let left = rowBytes; left > 0; left -= 128) runs.push(257 - Math.min(128, left), 0); // repeat 0x00 n times
  const row = Buffer.from(runs);
  const strip = Buffer.concat(Array.from({ length: height }, () => row));
  const entries: [tag: number, type: number, value: number][] = [
    [256, 4, width], // ImageWidth, LONG
    [257, 4, height], // ImageLength
    [258, 3, 1], // BitsPerSample, SHORT
    [259, 3, 32773], // Compression: PackBits
    [262, 3, 0], // PhotometricInterpretation: WhiteIsZero
    [273, 4, 8], // StripOffsets: the one strip after the header
    [277, 3, 1], // SamplesPerPixel
    [278, 4, height], // RowsPerStrip
    [279, 4, strip.length], // StripByteCounts
  ];
  const ifdSize = 2 + entries.length * 12 + 4;
  const firstIfd = 8 + strip.length + (strip.length % 2); // IFDs start on a word boundary
  const out = Buffer.alloc(firstIfd + pages * ifdSize);
  out.write('II', 0, 'latin1');
  out.writeUInt16LE(42, 2);
  out.writeUInt32LE(firstIfd, 4);
  strip.copy(out, 8);
  for (let p = 0; p < pages; p++) {
    let o = firstIfd + p * ifdSize;
    out.writeUInt16LE(entries.length, o);
    o += 2;
    for (const [tag, type, value] of entries) {
      out.writeUInt16LE(tag, o);
      out.writeUInt16LE(type, o + 2);
      out.writeUInt32LE(1, o + 4);
      if (type === 3) out.writeUInt16LE(value, o + 8);
      else out.writeUInt32LE(value, o + 8);
      o += 12;
    }
    out.writeUInt32LE(p + 1 < pages ? firstIfd + (p + 1) * ifdSize : 0, o);
  }
  return out;
}
