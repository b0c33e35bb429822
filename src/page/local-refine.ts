import type { Affine, Box } from './geometry.js';
import { composeAffine, transformBox } from './geometry.js';
import type { GrayImage } from './raster.js';
import { cropGray } from './raster.js';
import { translation, warpGray } from './warp.js';

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

/** Zero-mean normalized cross-correlation of `tpl` (tw x th) with `img` (iw wide) placed at (ox, oy), sampled every `step`. */
function ncc(tpl: Float32Array, tw: number, th: number, img: Float32Array, iw: number, ox: number, oy: number, step: number): number {
  let st = 0;
  let si = 0;
  let stt = 0;
  let sii = 0;
  let sti = 0;
  let n = 0;
  for (let y = 0; y < th; y += step) {
    const tr = y * tw;
    const ir = (y + oy) * iw + ox;
    for (let x = 0; x < tw; x += step) {
      const a = tpl[tr + x];
      const b = img[ir + x];
      st += a;
      si += b;
      stt += a * a;
      sii += b * b;
      sti += a * b;
      n++;
    }
  }
  const vt = stt - (st * st) / n;
  const vi = sii - (si * si) / n;
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
  let best: [number, number] = [0, 0];
  let bestScore = -2;
  // Coarse: every second shift, every second pixel.
  for (let dy = -s; dy <= s; dy += 2) {
    for (let dx = -s; dx <= s; dx += 2) {
      const v = ncc(tpl, w, h, img, iw, dx + s, dy + s, 2);
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
      const v = ncc(tpl, w, h, img, iw, dx + s, dy + s, 1);
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
