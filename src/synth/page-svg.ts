import type { Box } from '../image/geometry.js';
import { checkboxMarkSvg, checkboxOutlineSvg } from './checkbox-mark.js';
import type { FieldFill, Pen } from './fill.js';
import { FONT_FAMILIES, type FontKey } from '../image/fonts.js';
import { handwrittenDigitSvg } from './handwritten-digits.js';
import type { EntrySlot, Layout, Printed } from './layout-model.js';
import type { Rng } from './prng.js';
import { signatureSvg } from './signature-strokes.js';
import { escapeXml, gray, n, svgDocument } from '../image/svg.js';
import { estimateTextWidth, fitFontSize } from './text-metrics.js';

function textEl(x: number, y: number, size: number, font: FontKey, body: string, extra = ''): string {
  return `<text x="${n(x)}" y="${n(y)}" font-family="${FONT_FAMILIES[font]}" font-size="${n(size)}"${extra}>${body}</text>`;
}

function printedSvg(p: Printed): string {
  switch (p.kind) {
    case 'text': {
      const extra = `${p.bold ? ' font-weight="bold"' : ''}${p.anchor && p.anchor !== 'start' ? ` text-anchor="${p.anchor}"` : ''} fill="${gray(p.gray ?? 0)}"`;
      return textEl(p.x, p.y, p.size, p.font, escapeXml(p.text), extra);
    }
    case 'line':
      return `<line x1="${n(p.x1)}" y1="${n(p.y1)}" x2="${n(p.x2)}" y2="${n(p.y2)}" stroke="${gray(p.gray ?? 0)}" stroke-width="${p.stroke}"${p.dash ? ` stroke-dasharray="${p.dash} ${p.dash}"` : ''}/>`;
    case 'rect': {
      const fill = p.fillGray === undefined ? 'none' : gray(p.fillGray);
      const stroke = p.stroke > 0 ? ` stroke="${gray(p.gray ?? 0)}" stroke-width="${p.stroke}"` : '';
      return `<rect x="${n(p.box.x)}" y="${n(p.box.y)}" width="${n(p.box.w)}" height="${n(p.box.h)}" fill="${fill}"${stroke}/>`;
    }
  }
}

/** Group boxes of a "parts" entry (e.g. MM / DD / YYYY) and the separator positions between them. */
export function partBoxes(slot: EntrySlot): { groups: Box[]; separators: { x: number; y: number }[] } {
  if (slot.look.kind !== 'parts') return { groups: [slot.box], separators: [] };
  const { parts } = slot.look;
  const total = parts.reduce((s, p) => s + p, 0);
  const sepW = Math.min(30, slot.box.w * 0.06);
  const avail = slot.box.w - sepW * (parts.length - 1);
  const groups: Box[] = [];
  const separators: { x: number; y: number }[] = [];
  let x = slot.box.x;
  parts.forEach((p, i) => {
    const w = (avail * p) / total;
    groups.push({ x, y: slot.box.y, w, h: slot.box.h });
    x += w;
    if (i < parts.length - 1) {
      separators.push({ x: x + sepW / 2, y: slot.box.y + slot.box.h * 0.72 });
      x += sepW;
    }
  });
  return { groups, separators };
}

function entrySvg(slot: EntrySlot): string {
  const b = slot.box;
  const look = slot.look;
  switch (look.kind) {
    case 'box': {
      const fill = look.tint < 255 ? gray(look.tint) : 'none';
      return `<rect x="${n(b.x)}" y="${n(b.y)}" width="${n(b.w)}" height="${n(b.h)}" rx="${look.radius}" fill="${fill}" stroke="black" stroke-width="${look.stroke}"/>`;
    }
    case 'underline':
      return `<line x1="${n(b.x)}" y1="${n(b.y + b.h)}" x2="${n(b.x + b.w)}" y2="${n(b.y + b.h)}" stroke="black" stroke-width="${look.stroke}"${look.dash ? ` stroke-dasharray="${look.dash} ${look.dash}"` : ''}/>`;
    case 'cell':
      return '';
    case 'comb': {
      let s = `<rect x="${n(b.x)}" y="${n(b.y)}" width="${n(b.w)}" height="${n(b.h)}" fill="none" stroke="black" stroke-width="${look.stroke}"/>`;
      for (let i = 1; i < look.cells; i++) {
        const x = b.x + (b.w * i) / look.cells;
        s += `<line x1="${n(x)}" y1="${n(b.y)}" x2="${n(x)}" y2="${n(b.y + b.h)}" stroke="black" stroke-width="${Math.max(1, look.stroke - 1)}"/>`;
      }
      return s;
    }
    case 'parts': {
      const { groups, separators } = partBoxes(slot);
      const size = b.h * 0.6;
      return (
        groups.map((g) => `<rect x="${n(g.x)}" y="${n(g.y)}" width="${n(g.w)}" height="${n(g.h)}" fill="none" stroke="black" stroke-width="${look.stroke}"/>`).join('') +
        separators.map((p) => textEl(p.x, p.y, size, 'sans', escapeXml(look.separator), ' text-anchor="middle"')).join('')
      );
    }
    case 'lines': {
      let s = `<rect x="${n(b.x)}" y="${n(b.y)}" width="${n(b.w)}" height="${n(b.h)}" fill="none" stroke="black" stroke-width="${look.stroke}"/>`;
      for (let i = 1; i < look.lines; i++) {
        const y = b.y + (b.h * i) / look.lines;
        s += `<line x1="${n(b.x + 8)}" y1="${n(y)}" x2="${n(b.x + b.w - 8)}" y2="${n(y)}" stroke="${gray(120)}" stroke-width="1"/>`;
      }
      return s;
    }
    case 'checkbox':
      return checkboxOutlineSvg(b, look.shape, look.stroke);
    case 'signature': {
      let s = `<line x1="${n(b.x)}" y1="${n(b.y + b.h)}" x2="${n(b.x + b.w)}" y2="${n(b.y + b.h)}" stroke="black" stroke-width="${look.stroke}"/>`;
      if (look.marker) s += textEl(b.x + 4, b.y + b.h - 8, Math.min(40, b.h * 0.4), 'sans', 'X', ' font-weight="bold"');
      return s;
    }
  }
}

/** Written text in the page's pen, with the small irregularities of a person writing. */
function writtenText(x: number, baseline: number, size: number, text: string, pen: Pen, rng: Rng, anchor?: 'middle'): string {
  const angle = pen.handwriting ? rng.range(-2, 2) : rng.range(-0.3, 0.3);
  const t = ` transform="rotate(${n(angle)} ${n(x)} ${n(baseline)})"`;
  const a = anchor ? ` text-anchor="${anchor}"` : '';
  const fill = ` fill="${gray(pen.ink)}"`;
  if (!pen.handwriting) return textEl(x, baseline, size, pen.font, escapeXml(text), t + a + fill);
  // Each word sits a little above or below the last, as handwriting drifts off the baseline.
  let prev = 0;
  const spans = text.split(' ').map((w, i) => {
    const off = rng.range(-0.06, 0.06) * size;
    const dy = off - prev;
    prev = off;
    return `<tspan dy="${n(dy)}">${i > 0 ? ' ' : ''}${escapeXml(w)}</tspan>`;
  });
  // xml:space keeps the spaces that open each word's span (SVG collapses them otherwise).
  return textEl(x, baseline, size, pen.font, spans.join(''), `${t}${a}${fill} xml:space="preserve"`);
}

/** Break text into lines that fit `width` at `size`. */
export function wrapWords(text: string, font: FontKey, size: number, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const w of text.split(' ')) {
    const next = line ? `${line} ${w}` : w;
    if (line && estimateTextWidth(next, font, size) > width) {
      lines.push(line);
      line = w;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

/** How a text value is laid into its slot: the lines actually written (multi-line areas wrap). */
export function writtenLines(fill: FieldFill, pen: Pen): string[] {
  const slot = fill.field.slots[0];
  if (fill.text === null) return [];
  if (slot.look.kind !== 'lines') return [fill.text];
  const lineH = slot.writeBox.h / slot.look.lines;
  const size = Math.min(lineH * pen.size, 40);
  return wrapWords(fill.text, pen.font, size, slot.writeBox.w - 24).slice(0, slot.look.lines);
}

function fillSvg(fill: FieldFill, pen: Pen, rng: Rng): string {
  const field = fill.field;
  if (fill.marks) {
    return fill.marks
      .map((m, i) => {
        const slot = field.slots[i];
        const shape = slot.look.kind === 'checkbox' ? slot.look.shape : 'square';
        return checkboxMarkSvg(slot.box, shape, m, rng, pen.ink);
      })
      .join('');
  }
  const slot = field.slots[0];
  if (fill.signed) return signatureSvg(slot.writeBox, rng, pen.ink);
  if (fill.text === null) return '';
  const wb = slot.writeBox;
  const jitterY = () => (pen.handwriting ? rng.range(-0.05, 0.05) * wb.h : 0);
  if (slot.look.kind === 'comb') {
    const cw = wb.w / slot.look.cells;
    const size = Math.min(wb.h, cw * 1.4) * pen.size * 1.1;
    return [...fill.text]
      .slice(0, slot.look.cells)
      .map((ch, i) =>
        pen.realDigits && /[0-9]/.test(ch)
          ? handwrittenDigitSvg(ch, { x: wb.x + cw * i, y: wb.y, w: cw, h: wb.h }, rng, { ink: pen.ink })
          : writtenText(wb.x + cw * (i + 0.5), wb.y + wb.h * 0.78 + jitterY(), size, ch, pen, rng, 'middle'),
      )
      .join('');
  }
  if (slot.look.kind === 'parts') {
    const pieces = fill.text.split(/[^0-9A-Za-z]+/);
    const { groups } = partBoxes(slot);
    if (pieces.length === groups.length) {
      const size = wb.h * pen.size;
      return pieces.map((p, i) => writtenText(groups[i].x + groups[i].w / 2, wb.y + wb.h * 0.75 + jitterY(), fitFontSize(p, pen.font, size, groups[i].w - 6), p, pen, rng, 'middle')).join('');
    }
  }
  if (slot.look.kind === 'lines') {
    const lineH = wb.h / slot.look.lines;
    const size = Math.min(lineH * pen.size, 40);
    return writtenLines(fill, pen)
      .map((l, i) => writtenText(wb.x + 12, wb.y + lineH * (i + 0.78) + jitterY(), size, l, pen, rng))
      .join('');
  }
  const size = Math.min(wb.h * pen.size, pen.handwriting ? 52 : 38);
  const indent = rng.range(4, 0.08 * wb.w + 5);
  const fitted = fitFontSize(fill.text, pen.font, size, wb.w - indent - 6);
  return writtenText(wb.x + indent, wb.y + wb.h * 0.5 + fitted * 0.36 + jitterY(), fitted, fill.text, pen, rng);
}

/** SVG of the page: the printed form and, when fills are given, what the writer put on it. */
export function pageSvg(layout: Layout, fills: FieldFill[] | null, pen: Pen | null, rng: Rng): string {
  const parts: string[] = [];
  for (const p of layout.printed) parts.push(printedSvg(p));
  for (const f of layout.fields) for (const s of f.slots) parts.push(entrySvg(s));
  if (fills && pen) for (const f of fills) parts.push(fillSvg(f, pen, rng.fork(`ink:${f.field.name}`)));
  return svgDocument(layout.width, layout.height, parts.join(''));
}
