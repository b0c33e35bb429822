import { thresholdAt } from '../image/binary.js';
import { labelComponents } from '../image/components.js';
import type { Box } from '../image/geometry.js';
import { iou } from '../image/geometry.js';
import { inkThreshold } from '../image/ink.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray } from '../image/raster.js';

/**
 * Snap a roughly found entry area onto the printed rules of a blank form: each edge moves to the centre line of a
 * straight rule running along it nearby (a frame side, an underline), and stays put where there is none. A
 * detector's box is good to a few pixels; the printed frame is exact, and a schema region drawn on it lines up
 * with the form on every filled copy.
 */

export interface SnapOptions {
  /** How far an edge may move, as a share of the box's shorter side (default 0.5). */
  reach?: number;
  /** Which of two rules within reach to take (default 'inner'; 'outer' for combs, whose dividers are rules). */
  prefer?: 'inner' | 'outer';
  /** Share of the edge's inner span an unbroken stretch of ink must cover to count as a rule (default 0.6; common practice). */
  minCover?: number;
  /** Ink threshold (default: the page's Otsu threshold, clamped). */
  threshold?: number;
}

type Edge = 'top' | 'bottom' | 'left' | 'right';

/**
 * Longest stretch of ink along one row (horizontal edges) or column (vertical edges) within [from, to), as a share
 * of the span; gaps of up to 2 px (a scan's broken rule) do not end a stretch. Stretches, not totals: a column
 * through the stems of two text lines is mostly ink but broken by the gap between the lines; a rule is not.
 */
export function inkRunShare(img: GrayImage, horizontal: boolean, at: number, from: number, to: number, t: number): number {
  const lo = Math.max(0, Math.floor(from));
  const hi = Math.min(horizontal ? img.width : img.height, Math.ceil(to));
  if (hi <= lo || at < 0 || at >= (horizontal ? img.height : img.width)) return 0;
  let best = 0;
  let start = -1;
  let lastInk = -10;
  for (let i = lo; i < hi; i++) {
    if (img.data[horizontal ? at * img.width + i : i * img.width + at] > t) continue;
    if (i - lastInk > 3) start = i;
    lastInk = i;
    best = Math.max(best, i - start + 1);
  }
  return best / (hi - lo);
}

/**
 * Centre (continuous coordinate) of a rule along `edge` within reach, or null. Two cells side by side put two
 * rules a gap apart; `prefer` picks between them: 'inner' (the one nearest the box's middle: the cell's own
 * side when the found box spills over a neighbour) or 'outer' (a comb, whose inner cell dividers are rules too).
 */
function ruleNear(img: GrayImage, box: Box, edge: Edge, reach: number, minCover: number, t: number, prefer: 'inner' | 'outer'): number | null {
  const horizontal = edge === 'top' || edge === 'bottom';
  const pos = edge === 'top' ? box.y : edge === 'bottom' ? box.y + box.h : edge === 'left' ? box.x : box.x + box.w;
  // The inner 70 % of the edge's span, clear of the corners where the other sides' rules cross.
  const from = horizontal ? box.x + 0.15 * box.w : box.y + 0.15 * box.h;
  const to = horizontal ? box.x + 0.85 * box.w : box.y + 0.85 * box.h;
  const m = Math.max(3, Math.round(reach * Math.min(box.w, box.h)));
  const at = (k: number) => inkRunShare(img, horizontal, k, from, to, t);
  // Inward is +1 for the top and left edges, -1 for the bottom and right ones.
  const inward = edge === 'top' || edge === 'left' ? 1 : -1;
  const dir = prefer === 'inner' ? inward : -inward;
  const start = Math.floor(pos) - dir * m;
  // A printed rule is a few pixels thick; a line of text also covers much of a row, but over a dozen rows.
  const maxThick = Math.max(6, Math.round(0.12 * Math.min(box.w, box.h)));
  let best: number | null = null;
  for (let i = 0; i <= 2 * m; i++) {
    const k = start + dir * i;
    if (at(k) < minCover) continue;
    // The rule's rows (or columns): the run around k that keeps at least half the minimum cover.
    let a = k;
    let b = k;
    while (a > k - 2 * maxThick && at(a - 1) >= 0.5 * minCover) a--;
    while (b < k + 2 * maxThick && at(b + 1) >= 0.5 * minCover) b++;
    if (b - a + 1 <= maxThick) best = (a + b + 1) / 2;
  }
  return best;
}

/** The box with each edge on its nearby rule, where one exists. Pure. */
export function snapToRules(img: GrayImage, box: Box, options: SnapOptions = {}): Box {
  const reach = options.reach ?? 0.5;
  const prefer = options.prefer ?? 'inner';
  const minCover = options.minCover ?? 0.6;
  const t = options.threshold ?? inkThreshold(img);
  const top = ruleNear(img, box, 'top', reach, minCover, t, prefer) ?? box.y;
  const bottom = ruleNear(img, box, 'bottom', reach, minCover, t, prefer) ?? box.y + box.h;
  const left = ruleNear(img, box, 'left', reach, minCover, t, prefer) ?? box.x;
  const right = ruleNear(img, box, 'right', reach, minCover, t, prefer) ?? box.x + box.w;
  const out = { x: left, y: top, w: right - left, h: bottom - top };
  // A snap that changed the box's size by more than half is a rule of something else: keep the box.
  if (out.w < 0.5 * box.w || out.w > 1.5 * box.w || out.h < 0.5 * box.h || out.h > 1.5 * box.h) return box;
  return out;
}

/**
 * A checkbox's printed square: the hollow, roughly square ink component that overlaps the found box best (its
 * outer bounds), or null when there is none. Letters beside a box are solid or not square; the frame is one
 * component with an empty middle.
 */
export function snapToFrame(img: GrayImage, box: Box, options: Pick<SnapOptions, 'threshold'> = {}): Box | null {
  const t = options.threshold ?? inkThreshold(img);
  const side = Math.sqrt(box.w * box.h);
  const pad = Math.ceil(0.5 * side);
  const x0 = Math.max(0, Math.floor(box.x) - pad);
  const y0 = Math.max(0, Math.floor(box.y) - pad);
  const crop = cropGray(img, { x: x0, y: y0, w: box.w + 2 * pad, h: box.h + 2 * pad });
  const { components } = labelComponents(thresholdAt(crop, t));
  let best: Box | null = null;
  let bestIou = 0.2;
  for (const c of components) {
    const b = c.box;
    const aspect = b.w / b.h;
    if (aspect < 0.75 || aspect > 1.33) continue;
    if (Math.sqrt(b.w * b.h) < 0.5 * side || Math.sqrt(b.w * b.h) > 1.5 * side) continue;
    // Hollow: a frame's ink is its outline (a 3-px frame of a 30-px box fills about a third of it).
    if (c.area / (b.w * b.h) > 0.6) continue;
    const onPage = { x: b.x + x0, y: b.y + y0, w: b.w, h: b.h };
    const o = iou(onPage, box);
    if (o > bestIou) {
      bestIou = o;
      best = onPage;
    }
  }
  return best;
}
