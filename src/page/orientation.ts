import { labelComponents } from '../read/cleanup/components.js';
import { thresholdAt } from '../read/cleanup/binary.js';
import { estimateSkew } from './deskew.js';
import type { Affine, Box } from './geometry.js';
import { applyAffine, composeAffine, transformBox } from './geometry.js';
import { inkThreshold } from './ink.js';
import type { GrayImage } from './raster.js';
import type { QuarterTurn } from './warp.js';
import { quarterTurnAffine, rotateQuarter, rotationAbout } from './warp.js';

/**
 * Page orientation from the printed text itself, in two steps:
 * 1. Line direction: the nearest neighbour of a character is, far more often than not, the next character on the
 *    same line (the "docstrum" of O'Gorman, "The document spectrum for page layout analysis", IEEE PAMI 15(11),
 *    1993). Mostly horizontal neighbour links mean 0 or 180 degrees; mostly vertical ones mean 90 or 270.
 * 2. Up versus down: Latin lower case has many more ascenders (b d f h k l t, plus capitals and digits that rise
 *    above the x-height) than descenders (g j p q y) — a long-known cue for upside-down pages. Within each line,
 *    characters reaching above the line's typical top are counted as "up", those reaching below its typical
 *    bottom as "down"; an upright page has more "up" than "down".
 */

export interface OrientationEstimate {
  /** Clockwise quarter turn that makes the page upright. */
  rotation: QuarterTurn;
  /** 0..1: how one-sided the evidence is (0 = none either way). */
  confidence: number;
  /** Neighbour links between character-sized components: along rows and along columns. */
  horizontalLinks: number;
  verticalLinks: number;
  /** Characters rising above / dropping below their line, counted after the chosen turn. */
  up: number;
  down: number;
}

interface Glyph {
  box: Box;
  cx: number;
  cy: number;
}

/** Character-sized components: a few pixels to a few millimetres tall, not slivers, not frames. */
function glyphs(img: GrayImage): Glyph[] {
  const { components } = labelComponents(thresholdAt(img, inkThreshold(img)));
  // Sizes scale with resolution; the limits are set for a letter page 2200 px tall (200 dpi): 6..90 px is
  // about 0.75..11 mm, from a small x-height to large handwriting (common practice for glyph filters).
  const k = Math.max(img.width, img.height) / 2200;
  const out: Glyph[] = [];
  for (const c of components) {
    const b = c.box;
    if (c.touchesBorder || b.h < 6 * k || b.h > 90 * k || b.w > 120 * k || c.area < 12 * k * k) continue;
    if (c.area / (b.w * b.h) < 0.08) continue;
    out.push({ box: b, cx: b.x + b.w / 2, cy: b.y + b.h / 2 });
  }
  return out;
}

/** Bucket grid for neighbour queries. */
class Grid {
  private readonly cells = new Map<number, number[]>();
  constructor(
    items: readonly Glyph[],
    private readonly size: number,
  ) {
    items.forEach((g, i) => {
      const key = this.key(Math.floor(g.cx / size), Math.floor(g.cy / size));
      const list = this.cells.get(key) ?? [];
      list.push(i);
      this.cells.set(key, list);
    });
  }
  private key(i: number, j: number): number {
    return (i + 1000) * 100000 + (j + 1000);
  }
  /** Indices of items whose centre lies within `r` cells of the point's cell. */
  near(x: number, y: number, r = 1): number[] {
    const ci = Math.floor(x / this.size);
    const cj = Math.floor(y / this.size);
    const out: number[] = [];
    for (let i = ci - r; i <= ci + r; i++) for (let j = cj - r; j <= cj + r; j++) out.push(...(this.cells.get(this.key(i, j)) ?? []));
    return out;
  }
}

function nearestNeighbourLinks(gs: readonly Glyph[], cell: number): { horizontal: number; vertical: number } {
  const grid = new Grid(gs, cell);
  let horizontal = 0;
  let vertical = 0;
  gs.forEach((g, i) => {
    let best = -1;
    let bestD = Infinity;
    for (const j of grid.near(g.cx, g.cy)) {
      if (j === i) continue;
      const d = Math.hypot(gs[j].cx - g.cx, gs[j].cy - g.cy);
      if (d < bestD) {
        bestD = d;
        best = j;
      }
    }
    if (best < 0) return;
    const dx = Math.abs(gs[best].cx - g.cx);
    const dy = Math.abs(gs[best].cy - g.cy);
    // Within 30° of an axis (tan 30° ≈ 0.58); diagonal links say nothing.
    if (dy < 0.58 * dx) horizontal++;
    else if (dx < 0.58 * dy) vertical++;
  });
  return { horizontal, vertical };
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Count characters rising above / dropping below their line, boxes taken as upright text lines. */
export function ascenderEvidence(boxes: readonly Box[], cell: number): { up: number; down: number } {
  const gs = boxes.map((b) => ({ box: b, cx: b.x + b.w / 2, cy: b.y + b.h / 2 }));
  const grid = new Grid(gs, cell);
  let up = 0;
  let down = 0;
  gs.forEach((g, i) => {
    const b = g.box;
    const tops: number[] = [b.y];
    const bottoms: number[] = [b.y + b.h];
    for (const j of grid.near(g.cx, g.cy, 2)) {
      if (j === i) continue;
      const o = gs[j].box;
      const overlap = Math.min(b.y + b.h, o.y + o.h) - Math.max(b.y, o.y);
      const gap = Math.max(o.x - (b.x + b.w), b.x - (o.x + o.w));
      // Same line: they share half the shorter height and sit within two heights of each other.
      if (overlap >= 0.5 * Math.min(b.h, o.h) && gap <= 2 * Math.max(b.h, o.h)) {
        tops.push(o.y);
        bottoms.push(o.y + o.h);
      }
    }
    if (tops.length < 4) return;
    const top = median(tops);
    const bottom = median(bottoms);
    const xh = bottom - top;
    if (xh < 4) return;
    // Ascenders rise about 0.4 x-height above the x-line and descenders drop about as far below the baseline
    // in common sans and serif faces (from memory of typical font metrics); half of that clears blur and jitter.
    if (b.y < top - 0.2 * xh) up++;
    if (b.y + b.h > bottom + 0.2 * xh) down++;
  });
  return { up, down };
}

export interface OrientationOptions {
  /**
   * Skew of the page (degrees, see SkewEstimate) measured after the quarter turn that makes its lines
   * horizontal; estimated here when absent. Baselines must be level for the up/down count to be sharp.
   */
  skew?: number;
}

/** Character-sized components of a page, for orientation (exported so a caller can reuse them across steps). */
export function glyphBoxes(img: GrayImage): Box[] {
  return glyphs(img).map((g) => g.box);
}

function neighbourCell(width: number, height: number): number {
  return Math.max(16, Math.round((64 * Math.max(width, height)) / 2200));
}

/** Do the page's text lines run across (false) or down (true) the raster? */
export function linesRunDown(boxes: readonly Box[], width: number, height: number): { sideways: boolean; horizontal: number; vertical: number } {
  const gs = boxes.map((b) => ({ box: b, cx: b.x + b.w / 2, cy: b.y + b.h / 2 }));
  const links = nearestNeighbourLinks(gs, neighbourCell(width, height));
  return { sideways: links.vertical > links.horizontal, ...links };
}

/**
 * Finish the decision once the line direction and the skew (in the frame where lines run across) are known:
 * turn the glyph boxes with the page, level them (rotate each centre by -skew about the page centre), and let
 * ascenders outvote descenders.
 */
export function orientationFromGlyphs(boxes: readonly Box[], width: number, height: number, skew: number): OrientationEstimate {
  const lines = linesRunDown(boxes, width, height);
  const turns: [QuarterTurn, QuarterTurn] = lines.sideways ? [90, 270] : [0, 180];
  const turn = quarterTurnAffine(turns[0], width, height);
  const w = lines.sideways ? height : width;
  const h = lines.sideways ? width : height;
  const level = composeAffine(rotationAbout(-skew, w / 2, h / 2), turn);
  const levelled = boxes.map((box) => {
    const b = transformBox(turn, box);
    const [cx, cy] = applyAffine(level, [box.x + box.w / 2, box.y + box.h / 2]);
    return { x: cx - b.w / 2, y: cy - b.h / 2, w: b.w, h: b.h };
  });
  const ev = ascenderEvidence(levelled, neighbourCell(width, height));
  const upright = ev.up >= ev.down;
  const total = lines.horizontal + lines.vertical;
  const lineConf = total ? Math.abs(lines.horizontal - lines.vertical) / total : 0;
  const upConf = ev.up + ev.down ? Math.abs(ev.up - ev.down) / (ev.up + ev.down) : 0;
  return {
    rotation: upright ? turns[0] : turns[1],
    confidence: Math.min(lineConf, upConf),
    horizontalLinks: lines.horizontal,
    verticalLinks: lines.vertical,
    up: upright ? ev.up : ev.down,
    down: upright ? ev.down : ev.up,
  };
}

/** Detect the page's quarter-turn rotation. Pure. */
export function detectOrientation(img: GrayImage, options: OrientationOptions = {}): OrientationEstimate {
  const boxes = glyphBoxes(img);
  const skew = options.skew ?? estimateSkew(linesRunDown(boxes, img.width, img.height).sideways ? rotateQuarter(img, 90).image : img).angle;
  return orientationFromGlyphs(boxes, img.width, img.height, skew);
}
