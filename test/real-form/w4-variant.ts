import { copyFile, mkdtemp, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { loadSchema, type LoadedSchema } from '../../src/schema/load.js';
import { W4_BLANK } from './w4-layout.js';

/**
 * Small variants of the real W-4 blank for tests of one failure mode each: a schema with a few fields over the
 * blank's real cells (written beside a copy of the blank, so it has its reference image), and the blank with
 * invented entries (SVG text and strokes in blank pixels, 200 dpi) composited on it, as a typist or a pen would.
 */

export async function w4SchemaWith(fieldsYaml: string, name = 'w4-variant'): Promise<LoadedSchema> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'fg-w4v-'));
  await copyFile(W4_BLANK, path.join(dir, 'blank.png'));
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
export async function w4FilledWith(entries: readonly TextEntry[], extraSvg = ''): Promise<Buffer> {
  const texts = entries
    .map(
      (e) =>
        `<text x="${e.x}" y="${e.y}" font-family="${e.family ?? 'DejaVu Sans'}" font-size="${e.size ?? 30}" fill="#1a1a3a">${escapeXml(e.text)}</text>`,
    )
    .join('');
  const svg = Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="1700" height="2200">${texts}${extraSvg}</svg>`);
  return sharp(W4_BLANK).composite([{ input: svg }]).grayscale().png().toBuffer();
}
