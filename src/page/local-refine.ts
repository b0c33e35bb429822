import type { Affine, Box } from '../image/geometry.js';
import { composeAffine, transformBox } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray } from '../image/raster.js';
import { translation, warpGray } from '../image/warp.js';
import { summedArea, totals, windowTotal, type SummedArea } from '../image/summed-area.js';

/**
 * Field-by-field touch-up of a page alignment. One affine transform cannot follow a sheet that lay curved or
 * tilted on the glass (keystone): the corners of a page drift by several pixels from where the global fit puts
 * them, enough to move a small checkbox half out of its region. Around each region, the printed form of the
 * blank is matched to the page by normalized cross-correlation over small shifts, coarse (half resolution) then
 * fine, and the region follows the best shift.
 */

export interface RefineOptions {
  /** Largest shift searched, reference pixels (default 16). */
  search?: number;
  /** Context around the region matched with it, as a share of its shorter side (default 0.6, at least 24 px). */
  context?: number;
  /** Lowest correlation at the best shift for the shift to be trusted (default 0.5). */
  minScore?: number;
}

export interface RefinedRegion {
  /** The region on the page after the touch-up (page pixels). */
  box: Box;
  /** The shift found, reference pixels (0, 0 when none was trusted). */
  shift: [number, number];
  /** Correlation at the chosen shift, -1..1. */
  score: number;
}

/** Ink (255 - gray) of a raster as floats, for correlation. */
function inkOf(img: GrayImage): Float32Array {
  const out = new Float32Array(img.data.length);
  for (let i = 0; i < out.length; i++) out[i] = 255 - img.data[i];
  return out;
}

/** A plane of ink values with its summed-area tables: the image-side sums of every shifted window come from four
 *  lookups (Lewis, "Fast Normalized Cross-Correlation", 1995), so the correlation loop only multiplies. */
interface Plane extends SummedArea {
  data: Float32Array;
}

function plane(data: Float32Array, width: number, height: number): Plane {
  return { data, ...summedArea(data, width, height) };
}

/** The template side: it is only ever taken whole, so its two totals stand in for its tables. */
interface Template {
  data: Float32Array;
  width: number;
  height: number;
  sum: number;
  sumSq: number;
}

function template(data: Float32Array, width: number, height: number): Template {
  return { data, width, height, ...totals(data) };
}

/** Every second pixel of every second row, from (0, 0): what the coarse search sampled in place before. */
function decimate(data: Float32Array, width: number, height: number): { data: Float32Array; width: number; height: number } {
  const w2 = Math.ceil(width / 2);
  const h2 = Math.ceil(height / 2);
  const out = new Float32Array(w2 * h2);
  for (let y = 0; y < h2; y++) for (let x = 0; x < w2; x++) out[y * w2 + x] = data[2 * y * width + 2 * x];
  return { data: out, width: w2, height: h2 };
}

/** Zero-mean normalized cross-correlation of the template plane with the image plane placed at (ox, oy). */
function ncc(tpl: Template, img: Plane, ox: number, oy: number): number {
  const tw = tpl.width;
  const th = tpl.height;
  const iw = img.width;
  const t = tpl.data;
  const d = img.data;
  // Four partial sums: one running sum is bound by the latency of each addition, four keep the core busy.
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  for (let y = 0; y < th; y++) {
    let tr = y * tw;
    let ir = (y + oy) * iw + ox;
    const end = tr + tw;
    for (; tr + 3 < end; tr += 4, ir += 4) {
      s0 += t[tr] * d[ir];
      s1 += t[tr + 1] * d[ir + 1];
      s2 += t[tr + 2] * d[ir + 2];
      s3 += t[tr + 3] * d[ir + 3];
    }
    for (; tr < end; tr++, ir++) s0 += t[tr] * d[ir];
  }
  const sti = s0 + s1 + s2 + s3;
  const n = tw * th;
  // Ink values are whole numbers, so these sums are exact in any order: the totals equal the tables' corners.
  const st = tpl.sum;
  const vt = tpl.sumSq - (st * st) / n;
  const si = windowTotal(img.sum, iw, ox, oy, ox + tw, oy + th);
  const vi = windowTotal(img.sumSq, iw, ox, oy, ox + tw, oy + th) - (si * si) / n;
  if (vt <= 1e-6 || vi <= 1e-6) return -1;
  return (sti - (st * si) / n) / Math.sqrt(vt * vi);
}

/** Touch up one region's place on the page. `refToPage` is the page's global alignment. Pure. */
export function refineRegion(page: GrayImage, reference: GrayImage, refToPage: Affine, region: Box, options: RefineOptions = {}): RefinedRegion {
  const s = Math.round(options.search ?? 16);
  const c = Math.max(24, Math.round((options.context ?? 0.6) * Math.min(region.w, region.h)));
  const x0 = Math.floor(region.x) - c;
  const y0 = Math.floor(region.y) - c;
  const w = Math.ceil(region.w) + 2 * c;
  const h = Math.ceil(region.h) + 2 * c;
  const unmoved: RefinedRegion = { box: transformBox(refToPage, region), shift: [0, 0], score: -1 };
  if (x0 < 0 || y0 < 0 || x0 + w > reference.width || y0 + h > reference.height) return unmoved;
  const tpl = inkOf(cropGray(reference, { x: x0, y: y0, w, h }));
  // The page around the region, resampled into reference coordinates with `s` pixels to spare on every side.
  const sampled = warpGray(page, composeAffine(refToPage, translation(x0 - s, y0 - s)), w + 2 * s, h + 2 * s);
  const img = inkOf(sampled);
  const iw = w + 2 * s;
  const ih = h + 2 * s;
  const fineTpl = template(tpl, w, h);
  const fineImg = plane(img, iw, ih);
  // Coarse offsets dx + s run over even numbers, so every sampled pixel lies on the even grid of both planes.
  const t2 = decimate(tpl, w, h);
  const i2 = decimate(img, iw, ih);
  const coarseTpl = template(t2.data, t2.width, t2.height);
  const coarseImg = plane(i2.data, i2.width, i2.height);
  let best: [number, number] = [0, 0];
  let bestScore = -2;
  // Coarse: every second shift, every second pixel.
  for (let dy = -s; dy <= s; dy += 2) {
    for (let dx = -s; dx <= s; dx += 2) {
      const v = ncc(coarseTpl, coarseImg, (dx + s) / 2, (dy + s) / 2);
      if (v > bestScore) {
        bestScore = v;
        best = [dx, dy];
      }
    }
  }
  // Fine: every shift around the coarse best, every pixel.
  const [cx, cy] = best;
  bestScore = -2;
  for (let dy = Math.max(-s, cy - 2); dy <= Math.min(s, cy + 2); dy++) {
    for (let dx = Math.max(-s, cx - 2); dx <= Math.min(s, cx + 2); dx++) {
      const v = ncc(fineTpl, fineImg, dx + s, dy + s);
      if (v > bestScore) {
        bestScore = v;
        best = [dx, dy];
      }
    }
  }
  if (bestScore < (options.minScore ?? 0.5)) return { ...unmoved, score: bestScore };
  // A content shift of (dx, dy) in reference pixels: the form sits at reference point p + (dx, dy) in the sampled
  // frame, so the region moves by the same amount before going onto the page.
  const moved = { x: region.x + best[0], y: region.y + best[1], w: region.w, h: region.h };
  return { box: transformBox(refToPage, moved), shift: best, score: bestScore };
}
