import type { Box } from '../image/geometry.js';

/**
 * Matching scored detections of one class to ground-truth boxes, the step under every AP figure.
 *
 * Pixel conventions:
 * - `continuous`: a box [x, y, w, h] covers [x, x+w) × [y, y+h); area w·h (COCO, and this project's geometry).
 * - `inclusive`: a box covers pixels x..x+w and y..y+h inclusive; area (w+1)·(h+1) and an overlap a..b counts
 *   b−a+1 (the PASCAL VOC devkit convention, used by published VOC worked examples).
 *
 * Rules, both greedy over detections by descending score (ties keep input order):
 * - `voc`: the candidate is the ground truth with the highest IoU among all boxes of the image; a true positive when
 *   that IoU ≥ threshold and the box is not yet taken, otherwise a false positive (so a duplicate is a false positive)
 *   — the PASCAL VOC devkit rule.
 * - `coco`: the candidate is the unmatched ground truth with the highest IoU ≥ threshold; crowd regions
 *   (iscrowd = 1) can absorb any number of detections, which are then ignored rather than counted (COCO evaluation
 *   as described for the cocoapi evaluator, from memory: crowd overlap is intersection over the detection's area).
 */
export type PixelConvention = 'continuous' | 'inclusive';
export type MatchRule = 'voc' | 'coco';

export interface GroundTruthBox {
  imageId: string | number;
  box: Box;
  /** A crowd region (COCO iscrowd = 1): matches without counting. */
  crowd?: boolean;
}

export interface ScoredBox {
  imageId: string | number;
  box: Box;
  score: number;
}

export interface MatchOptions {
  iouThreshold: number;
  rule: MatchRule;
  convention: PixelConvention;
}

/** Detections in ranked order with their outcome; `ignored` ones (matched a crowd region) count neither way. */
export interface MatchResult {
  scores: number[];
  truePositive: boolean[];
  ignored: boolean[];
  /** Ground-truth boxes that count toward recall (crowd regions excluded). */
  groundTruthCount: number;
}

function spanOverlap(a0: number, a1: number, b0: number, b1: number, inclusive: boolean): number {
  return Math.max(0, Math.min(a1, b1) - Math.max(a0, b0) + (inclusive ? 1 : 0));
}

function boxArea(b: Box, inclusive: boolean): number {
  return inclusive ? (b.w + 1) * (b.h + 1) : Math.max(0, b.w) * Math.max(0, b.h);
}

function intersection(a: Box, b: Box, inclusive: boolean): number {
  return spanOverlap(a.x, a.x + a.w, b.x, b.x + b.w, inclusive) * spanOverlap(a.y, a.y + a.h, b.y, b.y + b.h, inclusive);
}

/** IoU in the given pixel convention. */
export function boxIou(a: Box, b: Box, convention: PixelConvention): number {
  const inclusive = convention === 'inclusive';
  const inter = intersection(a, b, inclusive);
  const union = boxArea(a, inclusive) + boxArea(b, inclusive) - inter;
  return union > 0 ? inter / union : 0;
}

/** Share of the detection inside a crowd region (COCO's crowd overlap). */
function crowdOverlap(det: Box, crowd: Box, convention: PixelConvention): number {
  const inclusive = convention === 'inclusive';
  const a = boxArea(det, inclusive);
  return a > 0 ? intersection(det, crowd, inclusive) / a : 0;
}

/** Rank detections and decide each one true positive, false positive or ignored. */
export function matchDetections(
  groundTruth: readonly GroundTruthBox[],
  detections: readonly ScoredBox[],
  options: MatchOptions,
): MatchResult {
  const byImage = new Map<string | number, { box: Box; crowd: boolean; taken: boolean }[]>();
  let groundTruthCount = 0;
  for (const g of groundTruth) {
    const list = byImage.get(g.imageId) ?? [];
    list.push({ box: g.box, crowd: g.crowd === true, taken: false });
    byImage.set(g.imageId, list);
    if (!g.crowd) groundTruthCount++;
  }
  const ranked = detections
    .map((d, i) => ({ d, i }))
    .sort((a, b) => b.d.score - a.d.score || a.i - b.i)
    .map((e) => e.d);

  const result: MatchResult = { scores: [], truePositive: [], ignored: [], groundTruthCount };
  for (const det of ranked) {
    const boxes = byImage.get(det.imageId) ?? [];
    const outcome = options.rule === 'voc' ? matchVoc(det.box, boxes, options) : matchCoco(det.box, boxes, options);
    result.scores.push(det.score);
    result.truePositive.push(outcome === 'tp');
    result.ignored.push(outcome === 'ignored');
  }
  return result;
}

type Outcome = 'tp' | 'fp' | 'ignored';
type Candidate = { box: Box; crowd: boolean; taken: boolean };

function matchVoc(det: Box, boxes: Candidate[], options: MatchOptions): Outcome {
  let best: Candidate | undefined;
  let bestIou = -1;
  for (const g of boxes) {
    const v = boxIou(det, g.box, options.convention);
    if (v > bestIou) {
      bestIou = v;
      best = g;
    }
  }
  if (!best || bestIou < options.iouThreshold) return 'fp';
  if (best.crowd) return 'ignored'; // VOC "difficult" boxes play the same part
  if (best.taken) return 'fp';
  best.taken = true;
  return 'tp';
}

function matchCoco(det: Box, boxes: Candidate[], options: MatchOptions): Outcome {
  let best: Candidate | undefined;
  let bestIou = options.iouThreshold;
  for (const g of boxes) {
    if (g.crowd || g.taken) continue;
    const v = boxIou(det, g.box, options.convention);
    if (v >= bestIou) {
      bestIou = v;
      best = g;
    }
  }
  if (best) {
    best.taken = true;
    return 'tp';
  }
  for (const g of boxes) {
    if (g.crowd && crowdOverlap(det, g.box, options.convention) >= options.iouThreshold) return 'ignored';
  }
  return 'fp';
}
