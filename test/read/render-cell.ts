import sharp from 'sharp';
import { useBundledFonts } from '../../src/image/fonts.js';
import type { Box } from '../../src/image/geometry.js';
import { grayFromImage, type GrayImage } from '../../src/image/raster.js';

/** An invented form fragment drawn for a test: a printed label, a boxed cell holding a value, ruled lines. */
export interface CellSpec {
  value: string;
  label?: string;
  font?: string;
  fontSize?: number;
  /** Draw the cell's rectangle (default true). */
  border?: boolean;
  /** Draw a ruled line through the page under the cell (default false). */
  underline?: boolean;
  /** Comb cells: number of cells; characters are centred one per cell. */
  comb?: number;
  /** Lighting: paper brightness goes from `light[0]` on the left to `light[1]` on the right (default white). */
  light?: [number, number];
  rotate?: number;
}

export interface RenderedCell {
  page: GrayImage;
  /** The cell box in page pixels: what a perfect detector would return. */
  box: Box;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

/** Render a small page (fonts from npm via fontconfig) and decode it to gray. */
export async function renderCell(spec: CellSpec): Promise<RenderedCell> {
  useBundledFonts();
  const W = 640, H = 200;
  const box: Box = { x: 40, y: 70, w: 520, h: 56 };
  const size = spec.fontSize ?? 26;
  const font = spec.font ?? 'DejaVu Sans';
  const parts: string[] = [];
  const [l0, l1] = spec.light ?? [255, 255];
  parts.push(
    `<defs><linearGradient id="g" x1="0" x2="1" y1="0" y2="0"><stop offset="0" stop-color="rgb(${l0},${l0},${l0})"/>` +
      `<stop offset="1" stop-color="rgb(${l1},${l1},${l1})"/></linearGradient></defs>`,
    `<rect width="${W}" height="${H}" fill="url(#g)"/>`,
  );
  if (spec.label) parts.push(`<text x="${box.x}" y="${box.y - 8}" font-family="DejaVu Sans" font-size="14">${esc(spec.label)}</text>`);
  if (spec.border ?? true) parts.push(`<rect x="${box.x}" y="${box.y}" width="${box.w}" height="${box.h}" fill="none" stroke="black" stroke-width="2"/>`);
  if (spec.underline) parts.push(`<line x1="0" x2="${W}" y1="${box.y + box.h + 30}" y2="${box.y + box.h + 30}" stroke="black" stroke-width="2"/>`);
  const baseline = box.y + box.h / 2 + size * 0.36;
  if (spec.comb) {
    const cw = box.w / spec.comb;
    for (let i = 1; i < spec.comb; i++) {
      const x = box.x + i * cw;
      parts.push(`<line x1="${x}" x2="${x}" y1="${box.y + box.h * 0.55}" y2="${box.y + box.h}" stroke="black" stroke-width="2"/>`);
    }
    [...spec.value].forEach((ch, i) => {
      parts.push(`<text x="${box.x + (i + 0.5) * cw}" y="${baseline}" text-anchor="middle" font-family="${font}" font-size="${size}">${esc(ch)}</text>`);
    });
  } else {
    parts.push(`<text x="${box.x + 10}" y="${baseline}" font-family="${font}" font-size="${size}">${esc(spec.value)}</text>`);
  }
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}">${parts.join('')}</svg>`;
  let img = sharp(Buffer.from(svg));
  if (spec.rotate) {
    img = sharp(await img.png().toBuffer()).rotate(spec.rotate, { background: '#ffffff' });
  }
  const page = await grayFromImage(await img.png().toBuffer());
  if (spec.rotate) {
    // sharp grows the canvas when rotating: the cell moves with the centre shift.
    const dx = (page.width - W) / 2, dy = (page.height - H) / 2;
    return { page, box: { ...box, x: box.x + dx, y: box.y + dy } };
  }
  return { page, box };
}
