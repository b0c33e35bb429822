import type { Box } from '../../image/geometry.js';
import { checkboxMarkSvg } from '../checkbox-mark.js';
import type { Pen } from '../fill.js';
import { FONT_FAMILIES, type FontKey } from '../../image/fonts.js';
import type { Rng } from '../prng.js';
import { signatureSvg } from '../signature-strokes.js';
import { escapeXml, gray, n } from '../../image/svg.js';
import { fitFontSize } from '../text-metrics.js';
import type { PdfFieldFill } from './plan.js';

/**
 * Draws one character into one comb cell (or one digit's room of a digit-only field), or returns null to let the
 * handwriting font draw it. Sources of handwritten digits (glyph images, stroke models) plug in here without
 * changing the filler (real-digits.ts).
 */
export type CombCellDrawer = (cell: Box, char: string, rng: Rng, pen: Pen) => string | null;

/**
 * Letters as a person writes them: the pen's font, not always centred, sometimes slanted or over the box edge. A
 * typing pen (pen.handwriting false) sets them straight on a steady baseline, as a typewriter or printer would.
 */
function writtenInBox(box: Box, text: string, pen: Pen, rng: Rng): string {
  const font = pen.font as FontKey;
  const hand = pen.handwriting;
  const size = fitFontSize(text, font, Math.min(box.h * pen.size * (hand ? 1.25 : 1), 44), box.w * 0.94);
  const x = box.x + (hand ? rng.range(0.01, 0.06) * box.w : 3);
  // Baseline near the bottom, with a drift that sometimes crosses the top or bottom edge (common practice).
  const drift = !hand ? 0 : rng.chance(0.15) ? rng.range(-0.35, 0.3) : rng.range(-0.08, 0.08);
  const y = box.y + box.h * (0.8 + drift);
  const slant = hand && rng.chance(0.4) ? rng.range(-12, 12) : 0;
  const tilt = hand ? rng.range(-1.5, 1.5) : 0;
  return `<text x="${n(x)}" y="${n(y)}" font-family="${FONT_FAMILIES[font]}" font-size="${n(size)}" fill="${gray(pen.ink)}" transform="rotate(${n(tilt)} ${n(x)} ${n(y)}) translate(${n(x)} ${n(y)}) skewX(${n(slant)}) translate(${n(-x)} ${n(-y)})">${escapeXml(text)}</text>`;
}

/** One character per comb cell (a comb of N cells holds at most N characters, ISO 32000-1 §12.7.4.3). */
function combText(box: Box, cells: number, text: string, pen: Pen, rng: Rng, drawCell?: CombCellDrawer): string {
  const cw = box.w / cells;
  let out = '';
  [...text].forEach((ch, i) => {
    const cell = { x: box.x + i * cw, y: box.y, w: cw, h: box.h };
    const custom = drawCell?.(cell, ch, rng, pen);
    if (custom) {
      out += custom;
      return;
    }
    const size = Math.min(box.h * pen.size * 1.2, cw * 1.5, 44);
    const x = cell.x + cw * rng.range(0.2, 0.4);
    const y = cell.y + box.h * rng.range(0.72, 0.86);
    out += `<text x="${n(x)}" y="${n(y)}" font-family="${FONT_FAMILIES[pen.font as FontKey]}" font-size="${n(size)}" fill="${gray(pen.ink)}">${escapeXml(ch)}</text>`;
  });
  return out;
}

/**
 * Width of one digit's room in a digit-only field, as a share of the box height: handwritten digits are about
 * 0.55..0.75 as wide as they are tall and people leave a little space between them (common practice; the MNIST
 * digits fill a 20 x 20 box of their 28 x 28 frame, handwritten-digits.ts scales the frame to the room).
 */
const DIGIT_ROOM = 0.7;

/** A field of digits alone (a postal code, an account or ID number) written digit by digit through the cell drawer;
 *  null when the drawer leaves any digit to the font (then the whole value is written in the font). */
function digitRow(box: Box, text: string, pen: Pen, rng: Rng, drawCell: CombCellDrawer): string | null {
  const room = Math.min(box.h * DIGIT_ROOM, (box.w * 0.94) / text.length);
  let x = box.x + rng.range(0.01, 0.06) * box.w;
  let out = '';
  for (const ch of text) {
    const drawn = drawCell({ x, y: box.y, w: room, h: box.h }, ch, rng, pen);
    if (!drawn) return null;
    out += drawn;
    x += room;
  }
  return out;
}

/** A mark that overflows its box now and then: ticks and crosses drawn on a box up to half again as large. */
function markSvg(box: Box, mark: Parameters<typeof checkboxMarkSvg>[2], rng: Rng, ink: number, hand: boolean): string {
  const grow = hand && (mark === 'tick' || mark === 'cross') && rng.chance(0.5) ? rng.range(1.15, 1.5) : 1;
  const g = { x: box.x - (box.w * (grow - 1)) / 2, y: box.y - (box.h * (grow - 1)) * 0.7, w: box.w * grow, h: box.h * grow };
  return checkboxMarkSvg(g, 'square', mark, rng, ink);
}

/** SVG of everything a person writes (or types, with a typing pen) on the page: text, comb characters, marks and
 *  signatures. */
export function handwritingSvg(fills: readonly PdfFieldFill[], pen: Pen, rng: Rng, drawCell?: CombCellDrawer): string {
  let body = '';
  for (const f of fills) {
    const r = rng.fork(`ink:${f.src.field.name}`);
    const box = f.src.boxes[0];
    // A typing pen marks a box with a plain cross, as a form filled on a screen prints it.
    const marks = pen.handwriting ? f.marks : f.marks?.map((m) => (m === 'empty' || m === 'dot' ? 'empty' : 'cross'));
    if (marks) marks.forEach((m, i) => (body += markSvg(f.src.boxes[i], m, r, pen.ink, pen.handwriting)));
    else if (f.value === true && (f.src.kind === 'signature' || f.src.field.type === 'signature')) body += signatureSvg(box, r, pen.ink);
    else if (f.text !== null) {
      const cells = f.src.kind === 'comb' ? f.src.widgets[0].maxLength : undefined;
      const digits = !cells && drawCell && /^[0-9]+$/.test(f.text) ? digitRow(box, f.text, pen, r, drawCell) : null;
      body += cells ? combText(box, cells, f.text, pen, r, drawCell) : (digits ?? writtenInBox(box, f.text, pen, r));
    }
  }
  return body;
}

/** Signatures alone, for typed pages (nobody types a signature). */
export function signaturesSvg(fills: readonly PdfFieldFill[], rng: Rng, ink: number): string {
  return fills
    .filter((f) => f.value === true && (f.src.kind === 'signature' || f.src.field.type === 'signature'))
    .map((f) => signatureSvg(f.src.boxes[0], rng.fork(`ink:${f.src.field.name}`), ink))
    .join('');
}
