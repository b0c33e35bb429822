import { copyFile, mkdtemp, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { extractDocument, loadDetector } from '../../src/api.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { grayFromImage, type GrayImage } from '../../src/image/raster.js';
import type { DocumentResult } from '../../src/result/document.js';
import { loadSchema, type LoadedSchema } from '../../src/schema/load.js';
import { encodePage } from '../../src/synth/encode-page.js';
import { rasterizeSvg } from '../../src/synth/rasterize.js';
import { REPO_ROOT, W4_BLANK } from './w4-layout.js';
import type { OcrEngine } from '../../src/read/ocr-engine.js';

/**
 * Small variants of a real blank (the W-4 by default, 1700 x 2200 at 200 dpi) for tests of one failure mode each:
 * a schema with a few fields over the blank's real cells (written beside a copy of the blank, so it has its
 * reference image), and the blank with invented entries (SVG text and strokes in blank pixels) composited on it, as
 * a typist or a pen would.
 */

/** Page 1 of DD Form 293 (2023), blank at 200 dpi: a dense form printed in capitals (see the fixture README). */
export const DD293_BLANK = path.join(REPO_ROOT, 'test/fixtures/real-forms/dod-dd293-2023-page1-blank.png');

export async function schemaOnBlank(fieldsYaml: string, blank = W4_BLANK, name = 'real-variant'): Promise<LoadedSchema> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'fg-blank-variant-'));
  await copyFile(blank, path.join(dir, 'blank.png'));
  const file = path.join(dir, `${name}.yaml`);
  const text = `form: { name: ${name}, version: "1" }\npages: [{ width: 1700, height: 2200, image: blank.png }]\nfields:\n${fieldsYaml}`;
  await writeFile(file, text);
  return loadSchema(file);
}

export interface TextEntry {
  x: number;
  /** Baseline. */
  y: number;
  text: string;
  size?: number;
  family?: string;
}

const escapeXml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

/** The blank with typed entries and any extra SVG (pen strokes), as grayscale PNG bytes (1700 x 2200). */
export async function filledBlank(entries: readonly TextEntry[], extraSvg = '', blank = W4_BLANK): Promise<Buffer> {
  const texts = entries
    .map(
      (e) =>
        `<text x="${e.x}" y="${e.y}" font-family="${e.family ?? 'DejaVu Sans'}" font-size="${e.size ?? 30}" fill="#1a1a3a">${escapeXml(e.text)}</text>`,
    )
    .join('');
  const svg = Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="1700" height="2200">${texts}${extraSvg}</svg>`);
  return sharp(blank).composite([{ input: svg }]).grayscale().png().toBuffer();
}

/**
 * The blank with pen writing in the bundled handwriting-style fonts: the SVG is rendered by the synthetic renderer
 * (which knows those fonts) on white paper and laid on the blank, the darker pixel winning (ink does not lighten
 * print). PNG bytes.
 */
export async function penOnBlank(svgBody: string, blank = W4_BLANK): Promise<Buffer> {
  const print = await grayFromImage(blank);
  const ink = await rasterizeSvg(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${print.width}" height="${print.height}"><rect width="100%" height="100%" fill="#fff"/>${svgBody}</svg>`,
  );
  const data = new Uint8Array(print.data.length);
  for (let i = 0; i < data.length; i++) data[i] = Math.min(print.data[i], ink.data[i]);
  const page: GrayImage = { width: print.width, height: print.height, data };
  return encodePage(page, 'png', 200);
}

/** Extract pages (PNG bytes) with the shipped detector and the test file's OCR engine, one document each; the records in order. */
export async function extractWithShippedModel(loaded: LoadedSchema, pages: readonly Buffer[], id: string, ocr: OcrEngine): Promise<DocumentResult[]> {
  const detector = await loadDetector(DEFAULT_MODEL_PATH, { intraOpThreads: 1 });
  try {
    const out: DocumentResult[] = [];
    for (const [i, png] of pages.entries()) out.push((await extractDocument(png, { schema: loaded, detector, ocr, documentId: `${id}-${i}` })).result);
    return out;
  } finally {
    await detector.close();
  }
}
