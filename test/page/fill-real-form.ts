import sharp from 'sharp';
import type { Affine } from '../../src/image/geometry.js';
import { fromRawBuffer } from '../../src/image/raster.js';
import type { GrayImage } from '../../src/image/raster.js';
import { REAL_BLANK } from './real-form.js';

/**
 * Invented entries composited onto the real blank form (fictional person, 555-01xx phone, example.org e-mail),
 * positioned on the form's cells at 200 dpi, as a typist or a pen would fill them.
 */
export interface Entry {
  x: number;
  y: number;
  text: string;
  size: number;
  family: string;
}

export const REAL_FORM_ENTRIES: Entry[] = [
  { x: 285, y: 283, text: 'Maren T.', size: 30, family: 'DejaVu Sans' },
  { x: 790, y: 283, text: 'Quillfeather', size: 30, family: 'DejaVu Sans' },
  { x: 285, y: 352, text: '418 Alder Bend Road', size: 30, family: 'DejaVu Sans' },
  { x: 285, y: 420, text: 'Fernhollow, ME 04101', size: 30, family: 'DejaVu Sans' },
  { x: 1150, y: 1275, text: '2,000', size: 28, family: 'DejaVu Sans Mono' },
  { x: 1150, y: 1325, text: '500', size: 28, family: 'DejaVu Sans Mono' },
  { x: 1430, y: 1400, text: '2,500', size: 28, family: 'DejaVu Sans Mono' },
  { x: 300, y: 1868, text: 'Maren Quillfeather', size: 40, family: 'DejaVu Serif' },
  { x: 1290, y: 1868, text: '03/14/2025', size: 30, family: 'DejaVu Sans' },
  { x: 285, y: 2025, text: 'Tidewater Kayak Rentals, 555-0142', size: 28, family: 'DejaVu Sans' },
  { x: 285, y: 2065, text: 'payroll@example.org', size: 28, family: 'DejaVu Sans' },
  { x: 1105, y: 2030, text: '01/06/2025', size: 28, family: 'DejaVu Sans' },
];

/** Checkbox "Single" ticked with an X (two strokes), in page pixels of the blank. */
const TICK = '<path d="M 325 441 L 347 463 M 347 441 L 325 463" stroke="#202020" stroke-width="4"/>';

function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

export function entriesSvg(width: number, height: number, entries: Entry[] = REAL_FORM_ENTRIES): string {
  const texts = entries
    .map((e) => `<text x="${e.x}" y="${e.y}" font-family="${e.family}" font-size="${e.size}" fill="#1a1a3a">${escapeXml(e.text)}</text>`)
    .join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">${texts}${TICK}</svg>`;
}

/** The blank form with the invented entries, as PNG bytes (1700 x 2200). */
export async function filledRealForm(): Promise<Buffer> {
  const meta = await sharp(REAL_BLANK).metadata();
  const svg = Buffer.from(entriesSvg(meta.width!, meta.height!));
  return sharp(REAL_BLANK).composite([{ input: svg }]).grayscale().png().toBuffer();
}

/** Only the entries on white paper, same size as the blank: what dropout should leave. */
export async function entriesOnly(): Promise<GrayImage> {
  const meta = await sharp(REAL_BLANK).metadata();
  const svg = Buffer.from(entriesSvg(meta.width!, meta.height!));
  const { data, info } = await sharp({ create: { width: meta.width!, height: meta.height!, channels: 3, background: '#ffffff' } })
    .composite([{ input: svg }])
    .grayscale()
    .raw()
    .toBuffer({ resolveWithObject: true });
  return fromRawBuffer(data, info.width, info.height, info.channels);
}

export interface Scanned {
  page: GrayImage;
  /** Ground-truth map from blank-form coordinates to page coordinates. */
  refToPage: Affine;
}

/**
 * "Scan" a form with libvips: scale by s, place at (left, top) on a larger white sheet. Geometry is done by sharp,
 * independently of our warp code; the truth transform follows from the resize and the offsets.
 */
export async function scanLike(png: Buffer, s: number, left: number, top: number, margin = 80): Promise<Scanned> {
  const meta = await sharp(png).metadata();
  const w = Math.round(meta.width! * s);
  const h = Math.round(meta.height! * s);
  const scaled = await sharp(png).grayscale().resize(w, h, { kernel: 'linear' }).raw().toBuffer();
  const W = w + 2 * margin;
  const H = h + 2 * margin;
  const { data, info } = await sharp({ create: { width: W, height: H, channels: 3, background: '#ffffff' } })
    .composite([{ input: scaled, raw: { width: w, height: h, channels: 1 }, left: margin + left, top: margin + top }])
    .grayscale()
    .raw()
    .toBuffer({ resolveWithObject: true });
  const sx = w / meta.width!;
  const sy = h / meta.height!;
  return {
    page: fromRawBuffer(data, info.width, info.height, info.channels),
    refToPage: { a: sx, b: 0, c: margin + left, d: 0, e: sy, f: margin + top },
  };
}

/**
 * How well a dropped-out page matches the truth: the share of printed-form ink (truth blank on the page, minus
 * entry pixels) turned to paper, and the share of entry ink still ink. All three rasters share the page's frame.
 */
export function inkRecovery(dropped: GrayImage, blankOnPage: GrayImage, entriesOnPage: GrayImage): { removed: number; kept: number } {
  let formInk = 0;
  let formLeft = 0;
  let entryInk = 0;
  let entryKept = 0;
  for (let i = 0; i < dropped.data.length; i++) {
    const isEntry = entriesOnPage.data[i] < 128;
    const ink = dropped.data[i] < 128;
    if (blankOnPage.data[i] < 128 && !isEntry) {
      formInk++;
      if (ink) formLeft++;
    }
    if (isEntry) {
      entryInk++;
      if (ink) entryKept++;
    }
  }
  return { removed: 1 - formLeft / Math.max(1, formInk), kept: entryKept / Math.max(1, entryInk) };
}
