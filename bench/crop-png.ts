/**
 * PNG encoding cost of the crops a run makes: a field-sized crop (what every OCR call encodes for tesseract.js, and
 * each review crop) and a context-sized crop with its frame (review), at zlib levels 6 (sharp's default), 3 and 1.
 * Prints ms per encode (the fastest of --repeat) and bytes, for src/image/raster.ts and src/review/crops.ts.
 *
 *   npx tsx bench/crop-png.ts [--page FILE] [--repeat 20]
 *
 * The bundled sample is a clean render; a generated scan with grain (the pages bench/batch-speed.ts generates) is what the
 * figures in the source comments were measured on.
 */
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import { decodeDocument } from '../src/input/decode.js';
import { cropGray, sharpFromGray, type GrayImage } from '../src/image/raster.js';

const root = path.resolve(import.meta.dirname, '..');
const { values: args } = parseArgs({
  options: { page: { type: 'string', default: path.join(root, 'samples/clinic-intake-typed.png') }, repeat: { type: 'string', default: '20' } },
});
const page = (await decodeDocument(args.page)).pages[0];
// Clamped to the page: the bundled sample is narrower than a 200-dpi letter page.
const field = cropGray(page, { x: 200, y: 400, w: Math.min(700, page.width - 200), h: 120 });
const context = cropGray(page, { x: 0, y: 300, w: Math.min(1500, page.width), h: 400 });
const frame = Buffer.from(
  `<svg xmlns="http://www.w3.org/2000/svg" width="${context.width}" height="${context.height}"><rect x="180" y="80" width="${field.width + 20}" height="140" fill="none" stroke="#d9480f" stroke-width="2"/></svg>`,
);

async function fastest(encode: () => Promise<Buffer>): Promise<{ ms: number; bytes: number }> {
  let ms = Infinity;
  let bytes = 0;
  for (let i = 0; i < Number(args.repeat); i++) {
    const t = performance.now();
    bytes = (await encode()).length;
    ms = Math.min(ms, performance.now() - t);
  }
  return { ms, bytes };
}

const gray = (img: GrayImage, level: number) => () => sharpFromGray(img).png({ compressionLevel: level }).toBuffer();
const framed = (level: number) => () => sharpFromGray(context).toColourspace('srgb').composite([{ input: frame, top: 0, left: 0 }]).png({ compressionLevel: level }).toBuffer();
for (const level of [6, 3, 1]) {
  const f = await fastest(gray(field, level));
  const c = await fastest(framed(level));
  console.log(`level ${level}: field crop ${field.width}x${field.height} ${f.ms.toFixed(1)} ms ${f.bytes} B; framed context ${context.width}x${context.height} ${c.ms.toFixed(1)} ms ${c.bytes} B`);
}
