import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray } from '../image/raster.js';
import { isBlank } from './cleanup/pipeline.js';
import { filterComponents } from '../image/components.js';
import { inkBounds } from './cleanup/text-band.js';
import { upscaleToCharacterHeight } from './cleanup/upscale.js';
import { trimAndPad } from './cleanup/pad.js';

/**
 * Cell boundaries of a comb field from its vertical-rule mask (removeRuledLines' `vertical`): columns inside the
 * field box where rule pixels cover at least a quarter of the box height are separators; neighbouring separator
 * columns merge; the box sides close the first and last cell. Cells narrower than 40 % of the median cell are
 * merged away (a doubled separator line). Returns cell boxes in crop pixels, left to right.
 * Printed combs are evenly spaced: when an even grid of cells across the box explains the separators (fitEvenGrid),
 * its cells are used, so that a written stroke standing like a separator does not cut a cell in two.
 */
export function combCells(vertical: Uint8Array, width: number, inner: Box): Box[] {
  const y0 = Math.max(0, Math.round(inner.y)), y1 = Math.round(inner.y + inner.h);
  const height = Math.round(vertical.length / width);
  const count = (x: number) => {
    let n = 0;
    for (let y = y0; y < Math.min(height, y1); y++) n += vertical[y * width + x];
    return n;
  };
  const cuts: number[] = [Math.max(0, Math.round(inner.x))];
  let run: number[] = [];
  const flush = () => {
    if (run.length) cuts.push(Math.round((run[0] + run[run.length - 1]) / 2));
    run = [];
  };
  for (let x = Math.max(0, Math.round(inner.x)); x < Math.min(width, Math.round(inner.x + inner.w)); x++) {
    if (count(x) >= 0.25 * inner.h) run.push(x);
    else flush();
  }
  flush();
  cuts.push(Math.min(width, Math.round(inner.x + inner.w)));
  cuts.sort((a, b) => a - b);
  const grid = fitEvenGrid(cuts);
  if (grid) {
    const boxes = grid.slice(1).map((c, i) => ({ x: grid[i], y: inner.y, w: c - grid[i], h: inner.h }));
    const pitch = [...boxes.map((b) => b.w)].sort((a, b) => a - b)[Math.floor(boxes.length / 2)];
    // A piece between the located box's side and the printed border, under 60 % of a cell, is no cell (at 40 % a
    // half-cell margin of a generated page's box was read as a doubtful empty cell; dropping every such piece lost
    // real first cells: bench/digit-comb-pages.ts).
    return boxes.filter((b, i) => (i > 0 && i < boxes.length - 1) || b.w >= 0.6 * pitch);
  }
  const widths = cuts.slice(1).map((c, i) => c - cuts[i]).filter((w) => w > 0);
  if (widths.length === 0) return [];
  const median = [...widths].sort((a, b) => a - b)[Math.floor(widths.length / 2)];
  const cells: Box[] = [];
  let left = cuts[0];
  for (let i = 1; i < cuts.length; i++) {
    if (cuts[i] - left < 0.4 * median && i < cuts.length - 1) continue;
    if (cuts[i] - left >= 0.4 * median) cells.push({ x: left, y: inner.y, w: cuts[i] - left, h: inner.h });
    left = cuts[i];
  }
  return mergeSplitCells(cells, median);
}

/**
 * The even grid across [cuts[0], cuts[last]] whose interior lines best match the found separators: for each cell
 * count n, a grid line is matched when a separator lies within max(3 px, 15 % of the pitch); the n with the most
 * matched lines wins among grids with at least 70 % of their lines matched (ties: fewer cells). Matched lines snap
 * to their separator. Null when no grid of 2 or more cells qualifies. Measured on bench/digit-combs.ts (MNIST test
 * digits in six-cell combs, odd half, seed 910001): strips cut into the wrong number of cells 4 of 125 -> 0.
 * The 15 % and 70 % are common-practice tolerances for a printed grid, not tuned.
 */
function fitEvenGrid(cuts: number[]): number[] | null {
  // The located box rarely sits exactly on the printed comb: its outer borders may be the first and last separators
  // found inside it rather than the box sides, so the grid is tried from either.
  let best: number[] | null = null;
  let bestMatched = 0;
  const los = cuts.length > 3 ? [0, 1] : [0];
  const his = cuts.length > 3 ? [cuts.length - 1, cuts.length - 2] : [cuts.length - 1];
  for (const a of los) {
    for (const b of his) {
      const fit = evenGrid(cuts[a], cuts[b], cuts.filter((_, i) => i > a && i < b));
      if (fit && fit.matched > bestMatched) {
        bestMatched = fit.matched;
        best = [...(a > 0 ? [cuts[0]] : []), ...fit.lines, ...(b < cuts.length - 1 ? [cuts[cuts.length - 1]] : [])];
      }
    }
  }
  return best;
}

/** The best even grid from lo to hi against the separators `inside` (see fitEvenGrid). */
function evenGrid(lo: number, hi: number, inside: number[]): { lines: number[]; matched: number } | null {
  let best: { lines: number[]; matched: number } | null = null;
  for (let n = 2; n <= Math.min(60, Math.floor((hi - lo) / 10)); n++) {
    const pitch = (hi - lo) / n;
    const tol = Math.max(3, 0.15 * pitch);
    const lines: number[] = [lo];
    let matched = 0;
    for (let k = 1; k < n; k++) {
      const at = lo + k * pitch;
      let near: number | null = null;
      for (const c of inside) if (Math.abs(c - at) <= tol && (near === null || Math.abs(c - at) < Math.abs(near - at))) near = c;
      if (near !== null) matched++;
      lines.push(Math.round(near ?? at));
    }
    lines.push(hi);
    if (matched >= 0.7 * (n - 1) && matched > (best?.matched ?? 0)) best = { lines, matched };
  }
  return best;
}

/**
 * Printed combs are evenly spaced, so two neighbouring pieces that are each under 70 % of the usual cell and
 * together 80..125 % of it are one cell cut by a written stroke (the upright of a 1 or a 7 standing on the bottom
 * rule looks like a separator). Measured on bench/digit-combs.ts: without the merge 4 of 30 six-cell strips of MNIST
 * test digits were cut into 7 cells; with it, none.
 */
function mergeSplitCells(cells: Box[], median: number): Box[] {
  const out: Box[] = [];
  for (let i = 0; i < cells.length; i++) {
    const a = cells[i];
    const b = cells[i + 1];
    if (b && a.w < 0.7 * median && b.w < 0.7 * median && a.w + b.w >= 0.8 * median && a.w + b.w <= 1.25 * median) {
      out.push({ ...a, w: b.x + b.w - a.x });
      i++;
    } else out.push(a);
  }
  return out;
}

/** One cell's image ready for single-character OCR (upscaled to `target` px), or null when the cell holds no character. */
export function cellImage(binary: GrayImage, cell: Box, target?: number): GrayImage | null {
  const piece = cropGray(binary, cell);
  const { image } = filterComponents(piece);
  if (isBlank(image)) return null;
  const up = upscaleToCharacterHeight(image, { target }).image;
  return trimAndPad(up, inkBounds(up));
}

/** Join per-cell characters: an empty cell between characters is a space; empty cells at the ends are dropped. */
export function joinCells(chars: (string | null)[]): string {
  return chars
    .map((c) => (c === null || c === '' ? ' ' : c))
    .join('')
    .trim()
    .replace(/ {2,}/g, ' ');
}
