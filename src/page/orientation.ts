import type { Box } from '../image/geometry.js';
import { inkThreshold } from '../image/ink.js';
import type { GrayImage } from '../image/raster.js';
import { findPhrases } from './text-phrases.js';
import type { QuarterTurn } from '../image/warp.js';

/**
 * Page orientation from the printed text itself, in two steps:
 * 1. Line direction: the nearest neighbour of a character is, far more often than not, the next character on the
 *    same line (the "docstrum" of O'Gorman, "The document spectrum for page layout analysis", IEEE PAMI 15(11),
 *    1993). Mostly horizontal neighbour links mean 0 or 180 degrees; mostly vertical ones mean 90 or 270.
 * 2. Up versus down, on the levelled page: Latin text has more ink above its x-height band (ascenders of
 *    b d f h k l t, capitals, digits, i-dots) than below it (descenders of g j p q y) — a long-known cue for
 *    upside-down pages. Each printed phrase votes with the balance of its ink above and below its densest rows;
 *    working on row profiles rather than on single letters keeps the cue when blur merges letters into words.
 */

export interface OrientationEstimate {
  /** Clockwise quarter turn that makes the page upright. */
  rotation: QuarterTurn;
  /** 0..1: how one-sided the evidence is (0 = none either way). */
  confidence: number;
  /** Neighbour links between character-sized components: along rows and along columns. */
  horizontalLinks: number;
  verticalLinks: number;
  /** Mean vote of the phrases, -1..1, after the chosen turn: positive = more ink above the x-height band. */
  upScore: number;
  /** Phrases that voted. */
  lines: number;
}

interface Glyph {
  box: Box;
  cx: number;
  cy: number;
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
 * Up/down evidence of a levelled page whose lines run across: per phrase of three or more characters, the ink in
 * the rows above its dense band (rows with at least half the fullest row's ink) against the ink below it.
 * Returns the mean vote (-1..1; positive = upright) and how many phrases voted. Pure.
 */
export function textBandEvidence(img: GrayImage): { score: number; lines: number } {
  const t = inkThreshold(img);
  let votes = 0;
  let lines = 0;
  for (const p of findPhrases(img)) {
    if (p.glyphs < 3) continue;
    const b = p.box;
    const profile: number[] = [];
    for (let y = b.y; y < b.y + b.h; y++) {
      let n = 0;
      const row = y * img.width;
      for (let x = b.x; x < b.x + b.w; x++) if (img.data[row + x] <= t) n++;
      profile.push(n);
    }
    const peak = Math.max(...profile);
    const first = profile.findIndex((v) => v >= 0.5 * peak);
    let last = profile.length - 1;
    while (last > 0 && profile[last] < 0.5 * peak) last--;
    let up = 0;
    let down = 0;
    for (let i = 0; i < first; i++) up += profile[i];
    for (let i = last + 1; i < profile.length; i++) down += profile[i];
    if (up + down === 0) continue;
    votes += (up - down) / (up + down);
    lines++;
  }
  return { score: lines ? votes / lines : 0, lines };
}

/** Combine the two steps' evidence into an estimate (sideways from linesRunDown, upScore from textBandEvidence). */
export function orientationEstimate(
  lines: { sideways: boolean; horizontal: number; vertical: number },
  band: { score: number; lines: number },
): OrientationEstimate {
  const upright = band.score >= 0;
  const turns: [QuarterTurn, QuarterTurn] = lines.sideways ? [90, 270] : [0, 180];
  const total = lines.horizontal + lines.vertical;
  const lineConf = total ? Math.abs(lines.horizontal - lines.vertical) / total : 0;
  return {
    rotation: upright ? turns[0] : turns[1],
    confidence: Math.min(lineConf, Math.abs(band.score)),
    horizontalLinks: lines.horizontal,
    verticalLinks: lines.vertical,
    upScore: Math.abs(band.score),
    lines: band.lines,
  };
}
