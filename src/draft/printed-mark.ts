import { INK, thresholdAt } from '../image/binary.js';
import { labelComponents } from '../image/components.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray } from '../image/raster.js';
import { inkRunShare, snapToFrame } from '../page/snap-box.js';

/**
 * Whether a checkbox detection on a blank form stands on a printed square or circle: the ink must be a closed ring
 * around an empty middle, and not a letter of a word. Capital letters (O, D, Q, C, G) and brackets of dense small
 * print look like boxes to the detector; drafting one as a checkbox cuts the letter out of the label beside it
 * ("ull_name" for "Full name"). A closed ring is checked on pixels: paper flood-filled from outside the ring must
 * leave an enclosed hole.
 */

/**
 * Enclosed paper as a share of the ring's bounding box. A printed square of side s with a stroke of 0.1 s encloses
 * 0.64 of its box, a thin-ruled one 0.8 (0.81..0.86 measured on the DD 293's boxes); a circle with a stroke of
 * 0.1 s encloses 0.5; a capital O of a sans-serif face about 0.45 and a bold one much less; C, G and brackets
 * enclose nothing (geometry of the shapes, our arithmetic). A ring enclosing SURE_HOLE or more is a printed square
 * even when its label touches it (real forms print labels 2 px from the box); between MIN_HOLE and SURE_HOLE (a
 * circle, or a round letter) it must also stand apart from the letters of its row.
 */
const MIN_HOLE = 0.5;
const SURE_HOLE = 0.62;

/**
 * A neighbour closer than this share of the ring's side on its row makes a round ring a letter of a word: letter
 * spacing is under a tenth of the letter height (common practice of typesetting).
 */
const WORD_GAP = 0.15;

/** Share of the ring's bounding box enclosed by it (paper not reachable from outside the box, 4-connected). */
export function enclosedShare(page: GrayImage, frame: Box, threshold: number): number {
  const x0 = Math.floor(frame.x) - 1;
  const y0 = Math.floor(frame.y) - 1;
  const crop = thresholdAt(cropGray(page, { x: x0, y: y0, w: Math.ceil(frame.w) + 2, h: Math.ceil(frame.h) + 2 }), threshold);
  const { width: w, height: h, data } = crop;
  const seen = new Uint8Array(w * h);
  const queue = new Int32Array(w * h);
  let tail = 0;
  const push = (p: number) => {
    if (!seen[p] && data[p] !== INK) {
      seen[p] = 1;
      queue[tail++] = p;
    }
  };
  for (let x = 0; x < w; x++) {
    push(x);
    push((h - 1) * w + x);
  }
  for (let y = 0; y < h; y++) {
    push(y * w);
    push(y * w + w - 1);
  }
  for (let head = 0; head < tail; head++) {
    const p = queue[head];
    const x = p % w;
    if (x > 0) push(p - 1);
    if (x < w - 1) push(p + 1);
    if (p >= w) push(p - w);
    if (p < (h - 1) * w) push(p + w);
  }
  let enclosed = 0;
  for (let p = 0; p < w * h; p++) if (!seen[p] && data[p] !== INK) enclosed++;
  return enclosed / Math.max(1, frame.w * frame.h);
}

/** Whether letter-sized ink stands within a letter space of the ring on its row (the ring is then a letter). */
export function inWord(page: GrayImage, frame: Box, threshold: number): boolean {
  const side = Math.max(frame.w, frame.h);
  const reach = Math.max(2, Math.ceil(WORD_GAP * side));
  const x0 = Math.max(0, Math.floor(frame.x) - reach - Math.ceil(side));
  const y0 = Math.max(0, Math.floor(frame.y) - 2);
  const crop = cropGray(page, { x: x0, y: y0, w: Math.ceil(frame.w) + 2 * reach + 2 * Math.ceil(side), h: Math.ceil(frame.h) + 4 });
  const { components } = labelComponents(thresholdAt(crop, threshold));
  const fx0 = frame.x - x0;
  const fx1 = fx0 + frame.w;
  const fy0 = frame.y - y0;
  const fy1 = fy0 + frame.h;
  return components.some((c) => {
    const b = c.box;
    // The ring itself, or ink running through it (a rule the ring sits on).
    if (b.x < fx1 && b.x + b.w > fx0) return false;
    // Letter-sized: a letter of the same line, not a rule, a line of the table or a speck.
    if (b.h < 0.4 * frame.h || b.h > 1.3 * frame.h || b.w > 2 * side) return false;
    const overlap = Math.min(b.y + b.h, fy1) - Math.max(b.y, fy0);
    if (overlap < 0.5 * b.h) return false;
    const gap = b.x >= fx1 ? b.x - fx1 : fx0 - (b.x + b.w);
    return gap < reach;
  });
}

/**
 * The printed square or circle under a checkbox detection on a blank page, or null when there is none: the hollow
 * ring `snapToFrame` finds, enclosing a hole of a printed square (or of a circle standing apart from letters).
 */
export function printedMark(page: GrayImage, box: Box, threshold: number): Box | null {
  const frame = snapToFrame(page, box, { threshold });
  if (!frame) return null;
  const hole = enclosedShare(page, frame, threshold);
  if (hole < MIN_HOLE) return null;
  if (hole < SURE_HOLE && inWord(page, frame, threshold)) return null;
  return frame;
}

/**
 * Whether a printed rule runs along the top or bottom edge of an entry area on a blank page (an underline, a
 * frame's side, a table cell's border): an unbroken stretch of ink over 60 % of the edge's inner span (the share
 * `snapToRules` takes for a rule), within a quarter of the area's height of the edge. Every entry area of a printed
 * form has one; a detection over body text or a heading has none (common practice of form layout).
 */
export function hasRule(page: GrayImage, box: Box, threshold: number): boolean {
  const reach = Math.max(3, Math.round(0.25 * box.h));
  const from = box.x + 0.15 * box.w;
  const to = box.x + 0.85 * box.w;
  for (const edge of [box.y + box.h, box.y]) {
    for (let y = Math.floor(edge) - reach; y <= Math.ceil(edge) + reach; y++) {
      if (inkRunShare(page, true, y, from, to, threshold) >= 0.6) return true;
    }
  }
  return false;
}

/**
 * Share of an area's width that must stay free of print in its lower half for a person to write there: 0.4
 * (measured on the development half of the real forms, bench/draft-real-forms.ts, where it drops the header cells of
 * tables and shaded section bands and keeps cells with a caption in the corner or a short label on the left).
 */
const MIN_WRITING_SPACE = 0.4;

/**
 * Whether a text entry on a blank has room to write: the longest stretch of columns without print in the lower half
 * of its inside (clear of its frame: 3 px or a tenth of the height at the edges) spans at least MIN_WRITING_SPACE of
 * its width. A table's header cell or a heading band is ruled like an entry but filled with its centred text.
 */
export function hasWritingSpace(page: GrayImage, box: Box, threshold: number): boolean {
  const m = Math.max(3, Math.round(0.1 * box.h));
  const x0 = Math.max(0, Math.round(box.x + m));
  const x1 = Math.min(page.width, Math.round(box.x + box.w - m));
  const y0 = Math.max(0, Math.round(box.y + 0.5 * box.h));
  const y1 = Math.min(page.height, Math.round(box.y + box.h - m));
  if (x1 - x0 < 4 || y1 - y0 < 2) return true;
  let best = 0;
  let run = 0;
  for (let x = x0; x < x1; x++) {
    let ink = false;
    for (let y = y0; y < y1 && !ink; y++) ink = page.data[y * page.width + x] <= threshold;
    run = ink ? 0 : run + 1;
    best = Math.max(best, run);
  }
  return best >= MIN_WRITING_SPACE * (x1 - x0);
}
