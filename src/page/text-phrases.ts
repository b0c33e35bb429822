import type { Box } from '../image/geometry.js';
import { glyphBoxes } from './glyphs.js';
import type { GrayImage } from '../image/raster.js';
import { median } from '../image/median.js';

/**
 * Printed phrases of an upright page — runs of characters on one line with no more than a word space between
 * neighbours — found from the geometry of character-sized ink components alone (no OCR). A form's labels are
 * such phrases; reading only the phrase next to an entry area keeps OCR to one short line per field.
 */

export interface Phrase {
  box: Box;
  /** Characters (components) in the phrase. */
  glyphs: number;
  /** Median component height: the phrase's type size in pixels. */
  charHeight: number;
}

export interface PhraseOptions {
  /** Components lying mostly (>= 60 % of their box) inside these boxes are not text (checkbox frames, comb cells). */
  exclude?: readonly Box[];
  /** Largest gap between neighbours, as a share of their height (default 1.5: a word space is 0.3..0.7 of it, a comma and space at small sizes up to 1.3). */
  maxGap?: number;
}

/** Group the page's character components into phrases. Pure. */
export function findPhrases(img: GrayImage, options: PhraseOptions = {}): Phrase[] {
  const exclude = options.exclude ?? [];
  const maxGap = options.maxGap ?? 1.5;
  const inside = (b: Box, e: Box) => {
    const ix = Math.max(0, Math.min(b.x + b.w, e.x + e.w) - Math.max(b.x, e.x));
    const iy = Math.max(0, Math.min(b.y + b.h, e.y + e.h) - Math.max(b.y, e.y));
    return ix * iy >= 0.6 * b.w * b.h;
  };
  const boxes = glyphBoxes(img).filter((b) => !exclude.some((e) => inside(b, e)));
  const order = boxes.map((_, i) => i).sort((a, b) => boxes[a].x - boxes[b].x);
  const parent = boxes.map((_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) i = parent[i] = parent[parent[i]];
    return i;
  };
  const tallest = boxes.reduce((m, b) => Math.max(m, b.h), 0);
  for (let oi = 0; oi < order.length; oi++) {
    const a = boxes[order[oi]];
    for (let oj = oi + 1; oj < order.length; oj++) {
      const b = boxes[order[oj]];
      if (b.x > a.x + a.w + maxGap * tallest) break;
      const gap = b.x - (a.x + a.w);
      const overlap = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y);
      // The gap is weighed against the taller neighbour (a word space after a comma is wide next to an x-height
      // letter), except when the two differ in size more than capitals and lower case do: then against the
      // smaller, so that a tall mark after a word (the "X" of a signature line) does not join it.
      const scale = Math.max(a.h, b.h) <= 2.2 * Math.min(a.h, b.h) ? Math.max(a.h, b.h) : Math.min(a.h, b.h);
      if (gap <= maxGap * scale && overlap >= 0.5 * Math.min(a.h, b.h)) parent[find(order[oj])] = find(order[oi]);
    }
  }
  const groups = new Map<number, number[]>();
  boxes.forEach((_, i) => {
    const r = find(i);
    const g = groups.get(r) ?? [];
    g.push(i);
    groups.set(r, g);
  });
  const out: Phrase[] = [];
  for (const g of groups.values()) {
    const x0 = Math.min(...g.map((i) => boxes[i].x));
    const y0 = Math.min(...g.map((i) => boxes[i].y));
    const x1 = Math.max(...g.map((i) => boxes[i].x + boxes[i].w));
    const y1 = Math.max(...g.map((i) => boxes[i].y + boxes[i].h));
    out.push({ box: { x: x0, y: y0, w: x1 - x0, h: y1 - y0 }, glyphs: g.length, charHeight: median(g.map((i) => boxes[i].h)) });
  }
  return out.sort((p, q) => p.box.y - q.box.y || p.box.x - q.box.x);
}
