import type { Box } from '../../image/geometry.js';
import type { GrayImage } from '../../image/raster.js';
import { createGray } from '../../image/raster.js';
import { INK, rowProfile } from '../../image/binary.js';
import { labelComponents, typicalHeight } from '../../image/components.js';

/** A run of rows that hold ink: one text line, found from the horizontal projection profile. */
export interface TextBand {
  top: number;
  /** Exclusive. */
  bottom: number;
  /** Ink pixels in the band. */
  ink: number;
}

/**
 * Split the rows into bands of ink separated by empty rows (projection-profile line segmentation; common practice).
 * Bands closer than `mergeGap` rows are merged so an i-dot, an accent or a descender stays with its line.
 */
export function textBands(img: GrayImage, mergeGap = 2): TextBand[] {
  const p = rowProfile(img);
  const bands: TextBand[] = [];
  let y = 0;
  while (y < img.height) {
    if (p[y] === 0) { y++; continue; }
    const top = y;
    let ink = 0;
    while (y < img.height && p[y] > 0) ink += p[y++];
    const last = bands[bands.length - 1];
    if (last && top - last.bottom <= mergeGap) {
      last.bottom = y;
      last.ink += ink;
    } else bands.push({ top, bottom: y, ink });
  }
  return bands;
}

export interface BandOptions {
  /** 'line' keeps the single band holding the field's value; 'block' keeps every band that overlaps the field box. */
  mode: 'line' | 'block';
  /** The field box in crop pixels: bands mostly outside it (a neighbouring line caught by padding) lose. */
  inside?: Box;
  /** Rows merged across, as a share of the tallest band. Default 0.25 (keeps dots and accents with their line). */
  mergeShare?: number;
}

function shareInside(b: TextBand, inside: Box | undefined): number {
  if (!inside) return 1;
  const top = Math.max(b.top, inside.y);
  const bottom = Math.min(b.bottom, inside.y + inside.h);
  return Math.max(0, bottom - top) / (b.bottom - b.top);
}

/**
 * Keep only the text line(s) holding the field's content; everything else becomes paper. Bands mostly outside the
 * field box (a neighbouring line caught by the padding) lose first; bands whose typical character is under 60 % of
 * the tallest band's (specks, rule remnants, small print) lose next. In line mode the lowest remaining band wins: a
 * label printed inside a cell sits in its top corner with the value written below it. Block mode keeps every
 * remaining band. (Common practice for boxed forms; the shares were checked on bench/cleanup-gain.ts.)
 */
export function isolateTextBand(img: GrayImage, options: BandOptions): { image: GrayImage; bands: TextBand[] } {
  const first = textBands(img, 0);
  if (first.length === 0) return { image: img, bands: [] };
  const tallest = Math.max(...first.map((b) => b.bottom - b.top));
  const bands = textBands(img, Math.max(1, Math.round(tallest * (options.mergeShare ?? 0.25))));
  const inBox = bands.filter((b) => shareInside(b, options.inside) >= 0.5);
  const candidates = inBox.length ? inBox : bands;
  const { components } = labelComponents(img);
  const heightOf = (b: TextBand) =>
    typicalHeight(components.filter((c) => c.box.y + c.box.h / 2 >= b.top && c.box.y + c.box.h / 2 < b.bottom)) ?? 0;
  const scored = candidates.map((b) => ({ b, h: heightOf(b) }));
  const top = Math.max(...scored.map((x) => x.h));
  const tall = scored.filter((x) => x.h >= 0.6 * top).map((x) => x.b);
  const chosen = options.mode === 'block' ? tall : [tall.reduce((a, b) => (b.top > a.top ? b : a))];
  const out = createGray(img.width, img.height);
  for (const b of chosen) {
    out.data.set(img.data.subarray(b.top * img.width, b.bottom * img.width), b.top * img.width);
  }
  return { image: out, bands: chosen };
}

/** Bounding box of the ink, or null when there is none. */
export function inkBounds(img: GrayImage): Box | null {
  let x0 = img.width, y0 = img.height, x1 = -1, y1 = -1;
  for (let y = 0; y < img.height; y++) {
    for (let x = 0; x < img.width; x++) {
      if (img.data[y * img.width + x] !== INK) continue;
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      if (y > y1) y1 = y;
    }
  }
  return x1 < 0 ? null : { x: x0, y: y0, w: x1 - x0 + 1, h: y1 - y0 + 1 };
}

/**
 * Drop stray pieces at the ends of a line: a group of components past a gap wider than 2.5 character heights at
 * the left or right end, all of whose members are thin strokes (no wider than 0.35 character heights in one
 * direction). Those are the ends of box sides and rules that survive the cut to the text band and read as "|",
 * "]" or "~". A word past such a gap has letters wider than that and stays.
 * (Common practice, checked on bench/cleanup-gain.ts.)
 */
export function dropStrayEnds(img: GrayImage): GrayImage {
  const { labels, components } = labelComponents(img);
  const h = typicalHeight(components);
  if (h === null || components.length < 2) return img;
  const sorted = [...components].sort((a, b) => a.box.x - b.box.x);
  const thin = (c: (typeof components)[number]) => Math.min(c.box.w, c.box.h) <= 0.35 * h;
  const drop = new Set<number>();
  for (const fromRight of [false, true]) {
    const order = fromRight ? [...sorted].reverse() : sorted;
    // Walk inward until the first gap wider than 2.5 h; the pieces passed form the end group.
    let reach = fromRight ? order[0].box.x : order[0].box.x + order[0].box.w;
    for (let i = 1; i < order.length; i++) {
      const c = order[i];
      const gap = fromRight ? reach - (c.box.x + c.box.w) : c.box.x - reach;
      if (gap > 2.5 * h) {
        const group = order.slice(0, i);
        if (group.every(thin) && i < order.length / 2) for (const g of group) drop.add(g.id);
        break;
      }
      reach = fromRight ? Math.min(reach, c.box.x) : Math.max(reach, c.box.x + c.box.w);
    }
  }
  if (drop.size === 0) return img;
  const out = { width: img.width, height: img.height, data: img.data.slice() };
  for (let k = 0; k < labels.length; k++) if (drop.has(labels[k])) out.data[k] = 255;
  return out;
}
