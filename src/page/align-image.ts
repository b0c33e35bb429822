import type { Affine } from '../image/geometry.js';
import { invertAffine } from '../image/geometry.js';
import type { Alignment } from './alignment.js';
import type { InkMap } from '../image/ink-map.js';
import { blurredInkMap, fromLevel, gradients, projection, toLevel } from '../image/ink-map.js';
import type { GrayImage } from '../image/raster.js';

/**
 * Direct registration of a page to the blank reference image, coarse to fine:
 * 1. at a coarse level, each axis's scale and shift from the best normalized correlation of the ink projection
 *    profiles (rows for y, columns for x) — cheap, global, and indifferent to where the filled-in ink lies;
 * 2. at each finer level, an affine refinement maximizing the enhanced correlation coefficient (ECC) of
 *    Evangelidis & Psarakis, "Parametric image alignment using enhanced correlation coefficient maximization",
 *    IEEE PAMI 30(10), 2008 — zero-mean normalized correlation, so it ignores contrast and paper tone.
 */

export interface ImageAlignOptions {
  /** Long sides, in map pixels, of the levels refined from coarse to fine (default [200, 400, 800]). */
  levels?: number[];
  /** Search range of each axis's scale relative to the size ratio of the two images (default [0.8, 1.25]). */
  scaleRange?: [number, number];
  /** Gauss-Newton iterations per level (default 30). */
  iterations?: number;
  /** Start from this reference -> page transform instead of the profile search. */
  initialRefToPage?: Affine;
}

interface AxisFit {
  scale: number;
  shift: number;
  ncc: number;
}

/** Best scale and shift mapping the reference profile onto the page profile: page(s*u + t) ~ ref(u). */
function fitProfile(ref: Float64Array, page: Float64Array, scales: [number, number], step: number): AxisFit {
  const n = ref.length;
  let mr = 0;
  for (let i = 0; i < n; i++) mr += ref[i];
  mr /= n;
  const rz = new Float64Array(n);
  let rn = 0;
  for (let i = 0; i < n; i++) {
    rz[i] = ref[i] - mr;
    rn += rz[i] * rz[i];
  }
  const pv = new Float64Array(n);
  const m = page.length;
  let best: AxisFit = { scale: 1, shift: 0, ncc: -Infinity };
  const sStep = 0.005;
  for (let s = scales[0]; s <= scales[1] + 1e-9; s += sStep) {
    // Shifts that keep at least half of the reference inside the page.
    const tMin = -0.5 * s * n;
    const tMax = m - 0.5 * s * n;
    for (let t = tMin; t <= tMax; t += step) {
      let mp = 0;
      for (let i = 0; i < n; i++) {
        const u = s * (i + 0.5) + t - 0.5;
        const j = Math.floor(u);
        const f = u - j;
        const a = j >= 0 && j < m ? page[j] : 0;
        const b = j + 1 >= 0 && j + 1 < m ? page[j + 1] : 0;
        pv[i] = a + (b - a) * f;
        mp += pv[i];
      }
      mp /= n;
      let num = 0;
      let pn = 0;
      for (let i = 0; i < n; i++) {
        const p = pv[i] - mp;
        num += p * rz[i];
        pn += p * p;
      }
      const ncc = pn > 0 && rn > 0 ? num / Math.sqrt(pn * rn) : -1;
      if (ncc > best.ncc) best = { scale: s, shift: t, ncc };
    }
  }
  return best;
}

/** Solve the symmetric 6x6 system H x = g by Gaussian elimination with partial pivoting; null if singular. */
function solve6(H: Float64Array, g: Float64Array): Float64Array | null {
  const n = 6;
  const A = new Float64Array(n * (n + 1));
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) A[r * (n + 1) + c] = H[r * n + c];
    A[r * (n + 1) + n] = g[r];
  }
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r * (n + 1) + c]) > Math.abs(A[p * (n + 1) + c])) p = r;
    if (Math.abs(A[p * (n + 1) + c]) < 1e-12) return null;
    if (p !== c) for (let k = 0; k <= n; k++) [A[c * (n + 1) + k], A[p * (n + 1) + k]] = [A[p * (n + 1) + k], A[c * (n + 1) + k]];
    for (let r = c + 1; r < n; r++) {
      const f = A[r * (n + 1) + c] / A[c * (n + 1) + c];
      for (let k = c; k <= n; k++) A[r * (n + 1) + k] -= f * A[c * (n + 1) + k];
    }
  }
  const x = new Float64Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let s = A[r * (n + 1) + n];
    for (let k = r + 1; k < n; k++) s -= A[r * (n + 1) + k] * x[k];
    x[r] = s / A[r * (n + 1) + r];
  }
  return x;
}

interface EccResult {
  refToPage: Affine;
  rho: number;
  /** Share of the reference map that fell inside the page at the last evaluation. */
  coverage: number;
}

/**
 * ECC maximization at one level: W maps reference map coordinates to page map coordinates.
 * Parameters are the affine entries in a frame centred and scaled on the reference map, so the normal
 * equations stay well conditioned.
 */
function refineEcc(ref: InkMap, page: InkMap, init: Affine, iterations: number): EccResult {
  const { gx, gy } = gradients(page);
  const rw = ref.width;
  const rh = ref.height;
  const pw = page.width;
  const ph = page.height;
  const cx = rw / 2;
  const cy = rh / 2;
  const sc = Math.max(rw, rh) / 2;
  // W(x) = init expressed on normalized coordinates X = (x - cx)/sc: u = A X + c'.
  let p = [init.a * sc, init.b * sc, init.a * cx + init.b * cy + init.c, init.d * sc, init.e * sc, init.d * cx + init.e * cy + init.f];
  let rho = -1;
  let coverage = 0;
  const H = new Float64Array(36);
  const gW = new Float64Array(6);
  const gR = new Float64Array(6);
  const g1 = new Float64Array(6);
  for (let it = 0; it < iterations; it++) {
    let h00 = 0, h01 = 0, h02 = 0, h03 = 0, h04 = 0, h05 = 0, h11 = 0, h12 = 0, h13 = 0, h14 = 0, h15 = 0;
    let h22 = 0, h23 = 0, h24 = 0, h25 = 0, h33 = 0, h34 = 0, h35 = 0, h44 = 0, h45 = 0, h55 = 0;
    let gw0 = 0, gw1 = 0, gw2 = 0, gw3 = 0, gw4 = 0, gw5 = 0;
    let gr0 = 0, gr1 = 0, gr2 = 0, gr3 = 0, gr4 = 0, gr5 = 0;
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0;
    let n = 0;
    let sw = 0;
    let sr = 0;
    let sww = 0;
    let srr = 0;
    let swr = 0;
    for (let y = 0; y < rh; y++) {
      const Y = (y + 0.5 - cy) / sc;
      for (let x = 0; x < rw; x++) {
        const X = (x + 0.5 - cx) / sc;
        const u = p[0] * X + p[1] * Y + p[2] - 0.5;
        const v = p[3] * X + p[4] * Y + p[5] - 0.5;
        const x0 = Math.floor(u);
        const y0 = Math.floor(v);
        if (x0 < 0 || y0 < 0 || x0 + 1 >= pw || y0 + 1 >= ph) continue;
        const tx = u - x0;
        const ty = v - y0;
        const o = y0 * pw + x0;
        const w00 = (1 - tx) * (1 - ty);
        const w10 = tx * (1 - ty);
        const w01 = (1 - tx) * ty;
        const w11 = tx * ty;
        const iw = page.data[o] * w00 + page.data[o + 1] * w10 + page.data[o + pw] * w01 + page.data[o + pw + 1] * w11;
        const ix = gx[o] * w00 + gx[o + 1] * w10 + gx[o + pw] * w01 + gx[o + pw + 1] * w11;
        const iy = gy[o] * w00 + gy[o + 1] * w10 + gy[o + pw] * w01 + gy[o + pw + 1] * w11;
        const ir = ref.data[y * rw + x];
        // Jacobian of the warped intensity w.r.t. the six parameters: [ix X, ix Y, ix, iy X, iy Y, iy]. The normal
        // equations are accumulated in scalars (upper triangle of H, row-major): the inner loop is the hottest in
        // the page stage, and V8 keeps scalars in registers where typed-array slots go through memory.
        const j0 = ix * X;
        const j1 = ix * Y;
        const j3 = iy * X;
        const j4 = iy * Y;
        h00 += j0 * j0; h01 += j0 * j1; h02 += j0 * ix; h03 += j0 * j3; h04 += j0 * j4; h05 += j0 * iy;
        h11 += j1 * j1; h12 += j1 * ix; h13 += j1 * j3; h14 += j1 * j4; h15 += j1 * iy;
        h22 += ix * ix; h23 += ix * j3; h24 += ix * j4; h25 += ix * iy;
        h33 += j3 * j3; h34 += j3 * j4; h35 += j3 * iy;
        h44 += j4 * j4; h45 += j4 * iy;
        h55 += iy * iy;
        gw0 += j0 * iw; gw1 += j1 * iw; gw2 += ix * iw; gw3 += j3 * iw; gw4 += j4 * iw; gw5 += iy * iw;
        gr0 += j0 * ir; gr1 += j1 * ir; gr2 += ix * ir; gr3 += j3 * ir; gr4 += j4 * ir; gr5 += iy * ir;
        s0 += j0; s1 += j1; s2 += ix; s3 += j3; s4 += j4; s5 += iy;
        n++;
        sw += iw;
        sr += ir;
        sww += iw * iw;
        srr += ir * ir;
        swr += iw * ir;
      }
    }
    coverage = n / (rw * rh);
    if (n < 100) break;
    H.set([
      h00, h01, h02, h03, h04, h05,
      h01, h11, h12, h13, h14, h15,
      h02, h12, h22, h23, h24, h25,
      h03, h13, h23, h33, h34, h35,
      h04, h14, h24, h34, h44, h45,
      h05, h15, h25, h35, h45, h55,
    ]);
    gW.set([gw0, gw1, gw2, gw3, gw4, gw5]);
    gR.set([gr0, gr1, gr2, gr3, gr4, gr5]);
    g1.set([s0, s1, s2, s3, s4, s5]);
    const mw = sw / n;
    const mr = sr / n;
    // Zero-mean versions: G^T (i - mean) = G^T i - mean * G^T 1.
    const pW = new Float64Array(6);
    const pR = new Float64Array(6);
    for (let r = 0; r < 6; r++) {
      pW[r] = gW[r] - mw * g1[r];
      pR[r] = gR[r] - mr * g1[r];
    }
    const wNorm2 = sww - n * mw * mw;
    const rNorm2 = srr - n * mr * mr;
    const corr = swr - n * mw * mr;
    if (wNorm2 <= 0 || rNorm2 <= 0) break;
    rho = corr / Math.sqrt(wNorm2 * rNorm2);
    const hW = solve6(H, pW);
    const hR = solve6(H, pR);
    if (!hW || !hR) break;
    let pWhW = 0;
    let pRhW = 0;
    for (let r = 0; r < 6; r++) {
      pWhW += pW[r] * hW[r];
      pRhW += pR[r] * hW[r];
    }
    const lambdaN = wNorm2 - pWhW;
    const lambdaD = corr - pRhW;
    if (lambdaD <= 0) break;
    const lambda = lambdaN / lambdaD;
    // error = lambda * ir - iw; G^T error = lambda * pR - pW; delta = H^-1 G^T error.
    const e = new Float64Array(6);
    for (let r = 0; r < 6; r++) e[r] = lambda * pR[r] - pW[r];
    const delta = solve6(H, e);
    if (!delta) break;
    p = p.map((v, i) => v + delta[i]);
    // Bound on the displacement of any map point (|X|,|Y| <= 1) caused by the update, in page map pixels;
    // a fiftieth of a map pixel is far below what the finest level can resolve.
    const move = Math.abs(delta[0]) + Math.abs(delta[1]) + Math.abs(delta[2]) + Math.abs(delta[3]) + Math.abs(delta[4]) + Math.abs(delta[5]);
    if (move < 0.02) break;
  }
  const a = p[0] / sc;
  const b = p[1] / sc;
  const d = p[3] / sc;
  const e = p[4] / sc;
  return { refToPage: { a, b, c: p[2] - a * cx - b * cy, d, e, f: p[5] - d * cx - e * cy }, rho, coverage };
}

function factorFor(img: GrayImage, longSide: number): number {
  return Math.max(1, Math.round(Math.max(img.width, img.height) / longSide));
}

/** Profile-based start: per-axis scale and shift at a coarse level, as a full-resolution ref -> page transform. */
function profileStart(page: GrayImage, reference: GrayImage, longSide: number, range: [number, number]): { t: Affine; ncc: number } {
  const kr = factorFor(reference, longSide);
  const kp = factorFor(page, longSide);
  const r = blurredInkMap(reference, kr, 1, 1);
  const p = blurredInkMap(page, kp, 1, 1);
  // Expected scale if page and reference show the same sheet: the ratio of their long sides.
  const s0 = Math.max(page.width, page.height) / kp / (Math.max(reference.width, reference.height) / kr);
  const sr: [number, number] = [s0 * range[0], s0 * range[1]];
  const fy = fitProfile(projection(r, 'y'), projection(p, 'y'), sr, 0.5);
  const fx = fitProfile(projection(r, 'x'), projection(p, 'x'), sr, 0.5);
  const level: Affine = { a: fx.scale, b: 0, c: fx.shift, d: 0, e: fy.scale, f: fy.shift };
  return { t: fromLevel(level, kr, kp), ncc: Math.min(fx.ncc, fy.ncc) };
}

/**
 * Register a page to the blank reference image. Returns the page -> reference transform, with score = the ECC
 * correlation at the finest level, lowered when under 90 % of the reference lies on the page, and 0 for an
 * implausible fit. Pure.
 */
export function alignByImage(page: GrayImage, reference: GrayImage, options: ImageAlignOptions = {}): Alignment {
  const levels = options.levels ?? [200, 400, 800];
  const iterations = options.iterations ?? 30;
  let refToPage = options.initialRefToPage ?? profileStart(page, reference, levels[0], options.scaleRange ?? [0.8, 1.25]).t;
  let rho = -1;
  let coverage = 0;
  for (let li = 0; li < levels.length; li++) {
    const kr = factorFor(reference, levels[li]);
    const kp = factorFor(page, levels[li]);
    // Wider blur at the coarsest level widens the basin of convergence; finer levels keep detail.
    const radius = li === 0 ? 2 : 1;
    const r = blurredInkMap(reference, kr, radius, 2);
    const p = blurredInkMap(page, kp, radius, 2);
    const res = refineEcc(r, p, toLevel(refToPage, kr, kp), iterations);
    if (!(res.rho > 0)) break;
    refToPage = fromLevel(res.refToPage, kr, kp);
    rho = res.rho;
    coverage = res.coverage;
  }
  return {
    method: 'image',
    transform: invertAffine(refToPage),
    refToPage,
    residual: null,
    inliers: 0,
    // A sheet shifted on the glass loses a few percent of the reference off the page edge; less than 90 % on the
    // page lowers the score in proportion (a fit that hides the reference off the page is no fit).
    score: plausible(refToPage, page, reference) ? Math.max(0, rho) * Math.min(1, coverage / 0.9) : 0,
  };
}

/**
 * Whether a registration is a sheet's, not a degenerate fit: the correlation can also be high when the reference
 * is squeezed into a blank corner of the page. Each axis's scale must lie within 0.7..1.4 of the size ratio of the
 * two images and the two axes within 25 % of each other (a scanner keeps the aspect ratio; common practice).
 */
function plausible(t: Affine, page: GrayImage, reference: GrayImage): boolean {
  const s0 = Math.max(page.width, page.height) / Math.max(reference.width, reference.height);
  const sx = Math.hypot(t.a, t.d) / s0;
  const sy = Math.hypot(t.b, t.e) / s0;
  return sx >= 0.7 && sx <= 1.4 && sy >= 0.7 && sy <= 1.4 && Math.max(sx, sy) <= 1.25 * Math.min(sx, sy);
}
