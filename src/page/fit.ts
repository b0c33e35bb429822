import type { Affine, Point } from '../image/geometry.js';

/**
 * Least-squares transforms from point correspondences src[i] -> dst[i], optionally weighted.
 * Similarity: the closed form of Umeyama ("Least-squares estimation of transformation parameters between two
 * point patterns", IEEE PAMI 13(4), 1991) without reflection. Affine: normal equations of the 6-parameter model.
 */

export type TransformModel = 'translation' | 'scale' | 'similarity' | 'affine';

function weightsOf(n: number, weights?: readonly number[]): number[] {
  return weights ? weights.slice(0, n) : new Array<number>(n).fill(1);
}

function centroid(pts: readonly Point[], w: number[]): Point {
  let sx = 0;
  let sy = 0;
  let sw = 0;
  for (let i = 0; i < pts.length; i++) {
    sx += w[i] * pts[i][0];
    sy += w[i] * pts[i][1];
    sw += w[i];
  }
  return sw > 0 ? [sx / sw, sy / sw] : [0, 0];
}

/** Least-squares transform of the given model; null when the points cannot determine it. */
export function fitTransform(
  model: TransformModel,
  src: readonly Point[],
  dst: readonly Point[],
  weights?: readonly number[],
): Affine | null {
  const n = Math.min(src.length, dst.length);
  if (n === 0) return null;
  const w = weightsOf(n, weights);
  const cs = centroid(src, w);
  const cd = centroid(dst, w);
  if (model === 'translation') return { a: 1, b: 0, c: cd[0] - cs[0], d: 0, e: 1, f: cd[1] - cs[1] };
  let sxx = 0;
  let dot = 0;
  let cross = 0;
  for (let i = 0; i < n; i++) {
    const px = src[i][0] - cs[0];
    const py = src[i][1] - cs[1];
    const qx = dst[i][0] - cd[0];
    const qy = dst[i][1] - cd[1];
    sxx += w[i] * (px * px + py * py);
    dot += w[i] * (px * qx + py * qy);
    cross += w[i] * (px * qy - py * qx);
  }
  if (sxx < 1e-9) return null;
  if (model === 'scale') {
    const s = dot / sxx;
    if (s <= 0) return null;
    return { a: s, b: 0, c: cd[0] - s * cs[0], d: 0, e: s, f: cd[1] - s * cs[1] };
  }
  if (model === 'similarity') {
    const p = dot / sxx;
    const q = cross / sxx;
    return { a: p, b: -q, c: cd[0] - p * cs[0] + q * cs[1], d: q, e: p, f: cd[1] - q * cs[0] - p * cs[1] };
  }
  return fitAffine(src, dst, w, cs, cd, n);
}

function fitAffine(src: readonly Point[], dst: readonly Point[], w: number[], cs: Point, cd: Point, n: number): Affine | null {
  // Centred normal equations: [Sxx Sxy; Sxy Syy] [a b]^T = [Sxu Syu]^T, likewise for (d, e).
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  let sxu = 0;
  let syu = 0;
  let sxv = 0;
  let syv = 0;
  for (let i = 0; i < n; i++) {
    const x = src[i][0] - cs[0];
    const y = src[i][1] - cs[1];
    const u = dst[i][0] - cd[0];
    const v = dst[i][1] - cd[1];
    sxx += w[i] * x * x;
    sxy += w[i] * x * y;
    syy += w[i] * y * y;
    sxu += w[i] * x * u;
    syu += w[i] * y * u;
    sxv += w[i] * x * v;
    syv += w[i] * y * v;
  }
  const det = sxx * syy - sxy * sxy;
  // Collinear points leave the affine model undetermined (relative test, scale-free).
  if (Math.abs(det) < 1e-9 * Math.max(1, sxx * syy)) return null;
  const a = (syy * sxu - sxy * syu) / det;
  const b = (sxx * syu - sxy * sxu) / det;
  const d = (syy * sxv - sxy * syv) / det;
  const e = (sxx * syv - sxy * sxv) / det;
  return { a, b, c: cd[0] - a * cs[0] - b * cs[1], d, e, f: cd[1] - d * cs[0] - e * cs[1] };
}

/** Root-mean-square distance between transformed src points and dst points. */
export function rmsError(t: Affine, src: readonly Point[], dst: readonly Point[]): number {
  const n = Math.min(src.length, dst.length);
  if (n === 0) return 0;
  let s = 0;
  for (let i = 0; i < n; i++) {
    const x = t.a * src[i][0] + t.b * src[i][1] + t.c - dst[i][0];
    const y = t.d * src[i][0] + t.e * src[i][1] + t.f - dst[i][1];
    s += x * x + y * y;
  }
  return Math.sqrt(s / n);
}
