import type { Affine } from '../image/geometry.js';
import { inkMask } from '../image/ink.js';
import type { GrayImage } from '../image/raster.js';
import { rotateGray } from '../image/warp.js';
import { median } from '../image/median.js';

/**
 * Small-angle skew by projection-profile search: rotate the lower edges of ink runs (baselines of text and
 * the edges of ruled lines) by candidate angles and keep the angle whose row histogram is most peaked
 * (largest sum of squared bin counts). Projection profiles for skew are a textbook method (e.g. Postl 1986;
 * survey: Hull, "Document image skew detection: survey and annotated bibliography", 1998).
 */

export interface SkewEstimate {
  /**
   * Angle of the content in degrees: positive when lines descend to the right (the content is turned
   * clockwise on screen). Correct it by rotating by -angle.
   */
  angle: number;
  /** 0..1: how much the best angle's profile stands out from a typical candidate's (0 = no evidence). */
  confidence: number;
  /** Number of edge points the estimate used. */
  points: number;
}

export interface SkewOptions {
  /** Largest skew searched, degrees (default 10). */
  maxAngle?: number;
  /** Ink threshold override (default: Otsu's, clamped). */
  threshold?: number;
}

interface EdgePoints {
  xs: Float64Array;
  ys: Float64Array;
}

/** Lower edges of ink runs: an ink pixel whose neighbour below is paper. */
function lowerEdges(img: GrayImage, threshold?: number): EdgePoints {
  const m = inkMask(img, threshold);
  const w = img.width;
  const h = img.height;
  let n = 0;
  for (let y = 0; y < h - 1; y++) {
    const row = y * w;
    for (let x = 0; x < w; x++) if (m[row + x] && !m[row + w + x]) n++;
  }
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  let k = 0;
  for (let y = 0; y < h - 1; y++) {
    const row = y * w;
    for (let x = 0; x < w; x++) {
      if (m[row + x] && !m[row + w + x]) {
        xs[k] = x + 0.5;
        ys[k] = y + 1;
        k++;
      }
    }
  }
  return { xs, ys };
}

/**
 * Sharpness of the row profile of points turned by -angle: sum of squared bin counts, with each point split
 * linearly between its two nearest bins so that the score varies smoothly with the angle.
 */
function profileScore(pts: EdgePoints, angleDeg: number, stride: number, binSize: number, bins: Float64Array, offset: number): number {
  const r = (angleDeg * Math.PI) / 180;
  const cos = Math.cos(r) / binSize;
  const sin = Math.sin(r) / binSize;
  bins.fill(0);
  const { xs, ys } = pts;
  const last = bins.length - 1;
  for (let i = 0; i < xs.length; i += stride) {
    const v = ys[i] * cos - xs[i] * sin + offset;
    const b = Math.floor(v);
    const t = v - b;
    if (b >= 0 && b < last) {
      bins[b] += 1 - t;
      bins[b + 1] += t;
    }
  }
  let s = 0;
  for (let i = 0; i < bins.length; i++) s += bins[i] * bins[i];
  return s;
}

interface Scan {
  angles: number[];
  scores: number[];
}

function scan(pts: EdgePoints, from: number, to: number, step: number, stride: number, binSize: number, bins: Float64Array, offset: number): Scan {
  const angles: number[] = [];
  const scores: number[] = [];
  const n = Math.round((to - from) / step);
  for (let i = 0; i <= n; i++) {
    const a = from + i * step;
    angles.push(a);
    scores.push(profileScore(pts, a, stride, binSize, bins, offset));
  }
  return { angles, scores };
}

function argmax(v: number[]): number {
  let best = 0;
  for (let i = 1; i < v.length; i++) if (v[i] > v[best]) best = i;
  return best;
}

/** Vertex of the parabola through the best sample and its neighbours (sub-step refinement). */
function parabolicPeak(s: Scan, i: number, step: number): number {
  if (i <= 0 || i >= s.scores.length - 1) return s.angles[i];
  const l = s.scores[i - 1];
  const c = s.scores[i];
  const r = s.scores[i + 1];
  const den = l - 2 * c + r;
  if (den >= 0) return s.angles[i];
  return s.angles[i] + (0.5 * (l - r) * step) / den;
}

interface PeakSearch {
  angle: number;
  confidence: number;
}

/** Coarse-to-fine search for the angle whose profile of these points is sharpest, within [from, to]. */
function searchAngle(pts: EdgePoints, diag: number, from: number, to: number): PeakSearch {
  const n = pts.xs.length;
  // Coarse pass: about 60k points, 2-px bins, 0.2° steps. The score's peak for short label lines is about
  // ±bin/length wide (±0.5° for a 200-px label), wider than the step, so the coarse peak is not missed.
  const coarseStride = Math.max(1, Math.floor(n / 60000));
  const coarseBin = 2;
  const coarseBins = new Float64Array(Math.ceil((2 * diag) / coarseBin) + 2);
  const coarseStep = 0.2;
  const coarse = scan(pts, from, to, coarseStep, coarseStride, coarseBin, coarseBins, diag / coarseBin);
  const ci = argmax(coarse.scores);
  // Fine pass: up to 400k points, 1-px bins, 0.02° steps around the coarse peak.
  const fineStride = Math.max(1, Math.floor(n / 400000));
  const fineBins = new Float64Array(Math.ceil(2 * diag) + 2);
  const fineStep = 0.02;
  const centre = coarse.angles[ci];
  const fine = scan(pts, centre - 0.3, centre + 0.3, fineStep, fineStride, 1, fineBins, diag);
  const angle = Math.max(from, Math.min(to, parabolicPeak(fine, argmax(fine.scores), fineStep)));
  const peak = coarse.scores[ci];
  const typical = median(coarse.scores);
  return { angle, confidence: peak > 0 ? Math.max(0, Math.min(1, (peak - typical) / peak)) : 0 };
}

function pointsWhere(pts: EdgePoints, y0: number, y1: number): EdgePoints {
  let n = 0;
  for (let i = 0; i < pts.ys.length; i++) if (pts.ys[i] >= y0 && pts.ys[i] < y1) n++;
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < pts.ys.length; i++) {
    if (pts.ys[i] >= y0 && pts.ys[i] < y1) {
      xs[k] = pts.xs[i];
      ys[k++] = pts.ys[i];
    }
  }
  return { xs, ys };
}

interface BandAngle {
  y: number;
  angle: number;
  weight: number;
}

/**
 * A sheet that does not lie flat (keystone) tilts lines near the top and bottom in opposite directions, the angle
 * changing about linearly down the page; the page's own rotation is the angle at its centre. So: one angle per
 * horizontal band, a weighted straight-line fit of angle against height, read at the centre.
 */
function centreAngleFromBands(pts: EdgePoints, img: GrayImage, diag: number, around: number): number | null {
  const bands = 6;
  const h = img.height / bands;
  const list: BandAngle[] = [];
  for (let b = 0; b < bands; b++) {
    const sub = pointsWhere(pts, b * h, (b + 1) * h);
    // Fewer than ~1500 edge points is a band with a line or two of text: too little to trust (measured on bench/page-normalize.ts).
    if (sub.xs.length < 1500) continue;
    const r = searchAngle(sub, diag, around - 2.5, around + 2.5);
    list.push({ y: (b + 0.5) * h, angle: r.angle, weight: sub.xs.length * r.confidence });
  }
  for (let round = 0; round < 2; round++) {
    if (list.length < 3) return null;
    let sw = 0;
    let sy = 0;
    let sa = 0;
    for (const b of list) {
      sw += b.weight;
      sy += b.weight * b.y;
      sa += b.weight * b.angle;
    }
    const my = sy / sw;
    const ma = sa / sw;
    let syy = 0;
    let sya = 0;
    for (const b of list) {
      syy += b.weight * (b.y - my) ** 2;
      sya += b.weight * (b.y - my) * (b.angle - ma);
    }
    const slope = syy > 0 ? sya / syy : 0;
    const at = (y: number) => ma + slope * (y - my);
    // Drop the band furthest off the line if it is off by more than 0.4° (a band misled by a table edge), then refit.
    let worst = -1;
    let worstOff = 0.4;
    list.forEach((b, i) => {
      const off = Math.abs(b.angle - at(b.y));
      if (off > worstOff) {
        worstOff = off;
        worst = i;
      }
    });
    if (worst < 0 || round === 1) return at(img.height / 2);
    list.splice(worst, 1);
  }
  return null;
}

/** Estimate a page's small skew (within ±maxAngle degrees). Pure. */
export function estimateSkew(img: GrayImage, options: SkewOptions = {}): SkewEstimate {
  const maxAngle = options.maxAngle ?? 10;
  const pts = lowerEdges(img, options.threshold);
  const n = pts.xs.length;
  if (n < 50) return { angle: 0, confidence: 0, points: n };
  const diag = Math.hypot(img.width, img.height);
  const global = searchAngle(pts, diag, -maxAngle, maxAngle);
  const centre = centreAngleFromBands(pts, img, diag, global.angle);
  const angle = Math.max(-maxAngle, Math.min(maxAngle, centre ?? global.angle));
  return { angle: Math.abs(angle) < 1e-9 ? 0 : angle, confidence: global.confidence, points: n };
}

export interface Deskewed {
  image: GrayImage;
  /** The estimated skew of the input, degrees (see SkewEstimate.angle). */
  skew: number;
  confidence: number;
  /** Maps input coordinates to coordinates of the deskewed raster. */
  transform: Affine;
}

/**
 * Estimate and remove skew. Angles under `minAngle` (default 0.05°, a drift of under 1.5 px across a
 * 200-dpi letter page, common practice) are left alone to spare a resampling pass.
 */
export function deskew(img: GrayImage, options: SkewOptions & { minAngle?: number } = {}): Deskewed {
  const est = estimateSkew(img, options);
  const minAngle = options.minAngle ?? 0.05;
  if (Math.abs(est.angle) < minAngle) {
    return {
      image: img,
      skew: est.angle,
      confidence: est.confidence,
      transform: { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 },
    };
  }
  const r = rotateGray(img, -est.angle);
  return { image: r.image, skew: est.angle, confidence: est.confidence, transform: r.transform };
}
