import type { Detection } from '../detect/types.js';
import type { Affine, Box, Point } from '../image/geometry.js';
import { center, invertAffine, iou, transformBox } from '../image/geometry.js';
import type { Alignment, LayoutRegion } from './alignment.js';
import { fitTransform, rmsError } from './fit.js';
import type { TransformModel } from './fit.js';

/**
 * Page -> reference transform from detections, hypothesize-and-verify in the manner of RANSAC (Fischler & Bolles,
 * CACM 24(6), 1981). One detection/region pair of the same class fixes a scale and a shift (the page is already
 * deskewed, so rotation is small); each hypothesis is scored by how many detections then land on a region of their
 * class; the best is refined by least squares over one-to-one matches.
 */

export interface DetectionAlignOptions {
  /** Model fitted to the inliers (default 'similarity'). */
  model?: TransformModel;
  /** IoU at which a transformed detection counts as landing on a region (default 0.3, common practice). */
  inlierIou?: number;
  /** Fewest inliers for an answer (default 3: two points fix a similarity, the third checks it). */
  minInliers?: number;
  /** Cap on hypotheses tried; beyond it a seeded sample is drawn (default 3000). */
  maxHypotheses?: number;
  /** Scale range a hypothesis may imply (default [0.4, 2.5]). */
  scaleRange?: [number, number];
}

interface Pair {
  det: number;
  region: number;
  overlap: number;
}

function scaleShift(det: Box, region: Box): Affine {
  const s = Math.sqrt((region.w * region.h) / Math.max(1e-9, det.w * det.h));
  const [dx, dy] = center(det);
  const [rx, ry] = center(region);
  return { a: s, b: 0, c: rx - s * dx, d: 0, e: s, f: ry - s * dy };
}

/** One-to-one matching of transformed detections to same-class regions, greedily by IoU. */
function matchPairs(t: Affine, dets: readonly Detection[], regions: readonly LayoutRegion[], minIou: number): Pair[] {
  const cands: Pair[] = [];
  for (let i = 0; i < dets.length; i++) {
    const b = transformBox(t, dets[i].box);
    for (let j = 0; j < regions.length; j++) {
      if (regions[j].className !== dets[i].className) continue;
      const o = iou(b, regions[j].box);
      if (o >= minIou) cands.push({ det: i, region: j, overlap: o });
    }
  }
  cands.sort((p, q) => q.overlap - p.overlap);
  const usedD = new Set<number>();
  const usedR = new Set<number>();
  const out: Pair[] = [];
  for (const c of cands) {
    if (usedD.has(c.det) || usedR.has(c.region)) continue;
    usedD.add(c.det);
    usedR.add(c.region);
    out.push(c);
  }
  return out;
}

/** Sum of best same-class IoUs above the threshold: a cheap score for one hypothesis. */
function support(t: Affine, dets: readonly Detection[], regions: readonly LayoutRegion[], minIou: number): number {
  let s = 0;
  for (const d of dets) {
    const b = transformBox(t, d.box);
    let best = 0;
    for (const r of regions) if (r.className === d.className) best = Math.max(best, iou(b, r.box));
    if (best >= minIou) s += best;
  }
  return s;
}

/** Small seeded generator so that sampling hypotheses is reproducible (mulberry32). */
function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function fitPairs(model: TransformModel, pairs: Pair[], dets: readonly Detection[], regions: readonly LayoutRegion[]): Affine | null {
  // Centres are robust to a region drawn with a margin around its area; with fewer than three pairs the
  // corners add the scale that centres alone cannot pin down.
  const src: Point[] = [];
  const dst: Point[] = [];
  for (const p of pairs) {
    const d = dets[p.det].box;
    const r = regions[p.region].box;
    src.push(center(d));
    dst.push(center(r));
    if (pairs.length < 3) {
      src.push([d.x, d.y], [d.x + d.w, d.y + d.h]);
      dst.push([r.x, r.y], [r.x + r.w, r.y + r.h]);
    }
  }
  return fitTransform(pairs.length < 3 && model === 'affine' ? 'similarity' : model, src, dst);
}

/** Estimate the page -> reference transform from detections; null when too few agree. Pure. */
export function alignByDetections(
  detections: readonly Detection[],
  regions: readonly LayoutRegion[],
  options: DetectionAlignOptions = {},
): Alignment | null {
  const model = options.model ?? 'similarity';
  const minIou = options.inlierIou ?? 0.3;
  const minInliers = options.minInliers ?? 3;
  const [smin, smax] = options.scaleRange ?? [0.4, 2.5];
  const maxHyp = options.maxHypotheses ?? 3000;
  if (detections.length === 0 || regions.length === 0) return null;

  const hyps: Array<[number, number]> = [];
  for (let i = 0; i < detections.length; i++)
    for (let j = 0; j < regions.length; j++) if (regions[j].className === detections[i].className) hyps.push([i, j]);
  if (hyps.length > maxHyp) {
    const rnd = seeded(hyps.length);
    for (let k = hyps.length - 1; k > 0; k--) {
      const m = Math.floor(rnd() * (k + 1));
      [hyps[k], hyps[m]] = [hyps[m], hyps[k]];
    }
    hyps.length = maxHyp;
  }

  let best: Affine | null = null;
  let bestSupport = 0;
  for (const [i, j] of hyps) {
    const t = scaleShift(detections[i].box, regions[j].box);
    if (t.a < smin || t.a > smax) continue;
    const s = support(t, detections, regions, minIou);
    if (s > bestSupport) {
      bestSupport = s;
      best = t;
    }
  }
  if (!best) return null;

  let t = best;
  let pairs = matchPairs(t, detections, regions, minIou);
  for (let round = 0; round < 4 && pairs.length >= 2; round++) {
    const refit = fitPairs(model, pairs, detections, regions);
    if (!refit) break;
    const next = matchPairs(refit, detections, regions, minIou);
    if (next.length < pairs.length) break;
    t = refit;
    pairs = next;
  }
  if (pairs.length < minInliers) return null;

  const src = pairs.map((p) => center(detections[p.det].box));
  const dst = pairs.map((p) => center(regions[p.region].box));
  return {
    method: 'detections',
    transform: t,
    refToPage: invertAffine(t),
    residual: rmsError(t, src, dst),
    inliers: pairs.length,
    score: pairs.length / regions.length,
    pairs: pairs.map((p) => [p.det, p.region]),
  };
}
