import type { Affine } from './geometry.js';
import { inkMask } from './ink.js';
import type { GrayImage } from './raster.js';
import { rotateGray } from './warp.js';

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

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Estimate a page's small skew (within ±maxAngle degrees). Pure. */
export function estimateSkew(img: GrayImage, options: SkewOptions = {}): SkewEstimate {
  const maxAngle = options.maxAngle ?? 10;
  const pts = lowerEdges(img, options.threshold);
  const n = pts.xs.length;
  if (n < 50) return { angle: 0, confidence: 0, points: n };
  const diag = Math.hypot(img.width, img.height);
  // Coarse pass: about 60k points, 2-px bins, 0.2° steps. The score's peak for short label lines is about
  // ±bin/length wide (±0.5° for a 200-px label), wider than the step, so the coarse peak is not missed.
  const coarseStride = Math.max(1, Math.floor(n / 60000));
  const coarseBin = 2;
  const coarseBins = new Float64Array(Math.ceil((2 * diag) / coarseBin) + 2);
  const coarseOffset = diag / coarseBin;
  const coarseStep = 0.2;
  const coarse = scan(pts, -maxAngle, maxAngle, coarseStep, coarseStride, coarseBin, coarseBins, coarseOffset);
  const ci = argmax(coarse.scores);
  // Fine pass: up to 400k points, 1-px bins, 0.02° steps around the coarse peak.
  const fineStride = Math.max(1, Math.floor(n / 400000));
  const fineBins = new Float64Array(Math.ceil(2 * diag) + 2);
  const fineStep = 0.02;
  const centre = coarse.angles[ci];
  const fine = scan(pts, centre - 0.3, centre + 0.3, fineStep, fineStride, 1, fineBins, diag);
  const fi = argmax(fine.scores);
  const angle = Math.max(-maxAngle, Math.min(maxAngle, parabolicPeak(fine, fi, fineStep)));
  const peak = coarse.scores[ci];
  const typical = median(coarse.scores);
  const confidence = peak > 0 ? Math.max(0, Math.min(1, (peak - typical) / peak)) : 0;
  return { angle: Math.abs(angle) < 1e-9 ? 0 : angle, confidence, points: n };
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
