import sharp from 'sharp';
import { useBundledFonts } from '../image/fonts.js';
import type { Reliability } from './reliability.js';
import { escapeXml } from '../image/svg.js';

/** Layout of the picture in pixels: the accuracy plot on top, a strip of bin counts below. */
const W = 740;
const H = 780;
const LEFT = 80;
const RIGHT = 50;
const TOP = 80;
const PLOT = W - LEFT - RIGHT;
const PLOT_H = 480;
const STRIP_TOP = TOP + PLOT_H + 70;
const STRIP_H = 100;


function fmt(v: number, digits: number): string {
  return v.toFixed(digits);
}

export interface DiagramLabels {
  /** First line of the title, e.g. "Reliability: all fields". */
  title: string;
}

/**
 * The reliability diagram as SVG: for each confidence bin a bar up to its observed accuracy, a marker at its
 * mean confidence, and the diagonal where accuracy equals confidence; below, the number of fields per bin
 * (square-root scale so that sparse low-confidence bins stay visible next to the crowded top bin).
 */
export function reliabilitySvg(rel: Reliability, labels: DiagramLabels): string {
  const x = (v: number): number => LEFT + v * PLOT;
  const y = (v: number): number => TOP + (1 - v) * PLOT_H;
  const parts: string[] = [];
  parts.push(`<rect x="0" y="0" width="${W}" height="${H}" fill="#ffffff"/>`);
  // grid and axes
  for (let t = 0; t <= 10; t++) {
    const v = t / 10;
    parts.push(`<line x1="${x(0)}" y1="${y(v)}" x2="${x(1)}" y2="${y(v)}" stroke="#e4e4e4" stroke-width="1"/>`);
    parts.push(`<line x1="${x(v)}" y1="${y(0)}" x2="${x(v)}" y2="${y(1)}" stroke="#e4e4e4" stroke-width="1"/>`);
    parts.push(`<text x="${x(0) - 8}" y="${y(v) + 5}" font-size="13" text-anchor="end">${fmt(v, 1)}</text>`);
    parts.push(`<text x="${x(v)}" y="${y(0) + 20}" font-size="13" text-anchor="middle">${fmt(v, 1)}</text>`);
  }
  // bars: observed accuracy per bin
  for (const b of rel.bins) {
    if (b.accuracy === null || b.confidence === null) continue;
    const bx = x(b.lower) + 1;
    const bw = Math.max(1, x(b.upper) - x(b.lower) - 2);
    parts.push(
      `<rect x="${bx}" y="${y(b.accuracy)}" width="${bw}" height="${y(0) - y(b.accuracy)}" fill="#4a7fb0" fill-opacity="0.85"/>`,
    );
    // gap between stated confidence and observed accuracy, drawn as an outlined band
    const top = Math.max(b.accuracy, b.confidence);
    const bottom = Math.min(b.accuracy, b.confidence);
    if (top - bottom > 0) {
      parts.push(
        `<rect x="${bx}" y="${y(top)}" width="${bw}" height="${y(bottom) - y(top)}" fill="#e0a030" fill-opacity="0.35" stroke="#c07a10" stroke-width="1"/>`,
      );
    }
    parts.push(`<circle cx="${x(b.lower) + (x(b.upper) - x(b.lower)) / 2}" cy="${y(b.confidence)}" r="4" fill="#222"/>`);
  }
  parts.push(
    `<line x1="${x(0)}" y1="${y(0)}" x2="${x(1)}" y2="${y(1)}" stroke="#555" stroke-width="1.5" stroke-dasharray="6 4"/>`,
  );
  parts.push(`<rect x="${x(0)}" y="${y(1)}" width="${PLOT}" height="${PLOT_H}" fill="none" stroke="#333"/>`);
  parts.push(
    `<text x="${x(0.5)}" y="${y(0) + 42}" font-size="15" text-anchor="middle">stated confidence</text>`,
    `<text transform="translate(22 ${y(0.5)}) rotate(-90)" font-size="15" text-anchor="middle">observed accuracy</text>`,
  );
  // title and summary
  const ece = rel.ece === null ? 'n/a' : fmt(rel.ece, 4);
  const mce = rel.mce === null ? 'n/a' : fmt(rel.mce, 4);
  parts.push(`<text x="${LEFT}" y="26" font-size="18" font-weight="bold">${escapeXml(labels.title)}</text>`);
  parts.push(
    `<text x="${LEFT}" y="46" font-size="14">ECE ${ece}   MCE ${mce}   bins ${rel.bins.length}   fields ${rel.count}</text>`,
    `<text x="${LEFT}" y="65" font-size="12" fill="#555">bar: observed accuracy; dot: mean confidence; ` +
      `band: the gap between them; dashed: perfect calibration</text>`,
  );
  // count strip
  const maxCount = Math.max(1, ...rel.bins.map((b) => b.count));
  const sy = (c: number): number => STRIP_TOP + STRIP_H - (Math.sqrt(c) / Math.sqrt(maxCount)) * STRIP_H;
  parts.push(`<text x="${LEFT}" y="${STRIP_TOP - 10}" font-size="13">fields per bin (square-root scale)</text>`);
  for (const b of rel.bins) {
    if (b.count === 0) continue;
    const bx = x(b.lower) + 1;
    const bw = Math.max(1, x(b.upper) - x(b.lower) - 2);
    parts.push(`<rect x="${bx}" y="${sy(b.count)}" width="${bw}" height="${STRIP_TOP + STRIP_H - sy(b.count)}" fill="#888"/>`);
    parts.push(`<text x="${bx + bw / 2}" y="${sy(b.count) - 3}" font-size="11" text-anchor="middle">${b.count}</text>`);
  }
  parts.push(
    `<line x1="${x(0)}" y1="${STRIP_TOP + STRIP_H}" x2="${x(1)}" y2="${STRIP_TOP + STRIP_H}" stroke="#333"/>`,
  );
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" ` +
    `font-family="DejaVu Sans, sans-serif" fill="#111">${parts.join('')}</svg>`
  );
}

/** The diagram rendered to PNG bytes (sharp's SVG renderer). */
export async function reliabilityPng(rel: Reliability, labels: DiagramLabels): Promise<Buffer> {
  useBundledFonts(); // the same glyphs on every machine; must precede sharp's first text layout
  return sharp(Buffer.from(reliabilitySvg(rel, labels))).png().toBuffer();
}
