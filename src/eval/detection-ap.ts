import {
  type GroundTruthBox,
  type MatchOptions,
  type MatchResult,
  type PixelConvention,
  type ScoredBox,
  matchDetections,
} from './detection-match.js';

/**
 * Average precision of a detector, per class.
 *
 * - VOC all-point AP: area under the precision envelope (precision made non-increasing from the right), summed where
 *   recall changes (PASCAL VOC 2010+ devkit; Padilla et al., IWSSIP 2020).
 * - VOC 11-point AP: mean of the envelope at recall 0, 0.1, ..., 1 (PASCAL VOC 2007).
 * - COCO AP: mean of the envelope sampled at 101 recall points 0, 0.01, ..., 1 (the precision at the first ranked
 *   point reaching each recall; 0 past the final recall); AP@0.5:0.95 averages it over IoU 0.50, 0.55, ..., 0.95
 *   (COCO detection evaluation, as published with the dataset).
 */

/** IoU thresholds 0.50:0.05:0.95 (COCO). Written out so no float step drifts. */
export const COCO_IOU_THRESHOLDS = [0.5, 0.55, 0.6, 0.65, 0.7, 0.75, 0.8, 0.85, 0.9, 0.95] as const;

export interface PrecisionRecall {
  precision: number[];
  recall: number[];
  truePositives: number;
  falsePositives: number;
}

/** Cumulative precision and recall down the ranked list; ignored detections are skipped. */
export function precisionRecall(match: MatchResult): PrecisionRecall {
  const precision: number[] = [];
  const recall: number[] = [];
  let tp = 0;
  let fp = 0;
  for (let i = 0; i < match.scores.length; i++) {
    if (match.ignored[i]) continue;
    if (match.truePositive[i]) tp++;
    else fp++;
    precision.push(tp / (tp + fp));
    recall.push(match.groundTruthCount > 0 ? tp / match.groundTruthCount : 0);
  }
  return { precision, recall, truePositives: tp, falsePositives: fp };
}

/** Precision made non-increasing from the right: the best precision reachable at this recall or beyond. */
function envelope(precision: readonly number[]): number[] {
  const out = precision.slice();
  for (let i = out.length - 2; i >= 0; i--) out[i] = Math.max(out[i], out[i + 1]);
  return out;
}

export function allPointAp(pr: Pick<PrecisionRecall, 'precision' | 'recall'>): number {
  const mrec = [0, ...pr.recall, 1];
  const mpre = envelope([0, ...pr.precision, 0]);
  let ap = 0;
  for (let i = 1; i < mrec.length; i++) ap += (mrec[i] - mrec[i - 1]) * mpre[i];
  return ap;
}

export function elevenPointAp(pr: Pick<PrecisionRecall, 'precision' | 'recall'>): number {
  let sum = 0;
  for (let k = 0; k <= 10; k++) {
    const r = k / 10;
    let best = 0;
    for (let i = 0; i < pr.recall.length; i++) if (pr.recall[i] >= r) best = Math.max(best, pr.precision[i]);
    sum += best;
  }
  return sum / 11;
}

/** The envelope sampled at recall 0, 0.01, ..., 1 (101 values), as COCO does. */
export function interpolatedPrecision101(pr: Pick<PrecisionRecall, 'precision' | 'recall'>): number[] {
  const env = envelope(pr.precision);
  const out: number[] = [];
  let i = 0;
  for (let k = 0; k <= 100; k++) {
    const r = k / 100;
    while (i < pr.recall.length && pr.recall[i] < r) i++; // first ranked point with recall >= r
    out.push(i < env.length ? env[i] : 0);
  }
  return out;
}

export function cocoAp(pr: Pick<PrecisionRecall, 'precision' | 'recall'>): number {
  const p = interpolatedPrecision101(pr);
  return p.reduce((a, b) => a + b, 0) / p.length;
}

export interface ClassEvaluation {
  groundTruth: number;
  detections: number;
  /** COCO 101-point AP at IoU 0.5; null when the class has no ground truth (undefined, as COCO reports -1). */
  ap50: number | null;
  /** COCO AP averaged over IoU 0.50:0.05:0.95. */
  ap50to95: number | null;
  /** VOC all-point and 11-point AP at IoU 0.5. */
  vocAllPointAp50: number | null;
  vocElevenPointAp50: number | null;
  /** At the operating score threshold, IoU 0.5: precision = TP / detections kept, recall = TP / ground truth. */
  operating: { scoreThreshold: number; truePositives: number; falsePositives: number; precision: number | null; recall: number | null };
  /** Interpolated precision at recall 0, 0.01, ..., 1 (IoU 0.5), for plotting. */
  curve: number[];
}

export interface EvaluateOptions {
  scoreThreshold: number;
  convention?: PixelConvention;
}

/** All figures for one class from its ground truth and scored detections (any number of images). */
export function evaluateClass(
  groundTruth: readonly GroundTruthBox[],
  detections: readonly ScoredBox[],
  options: EvaluateOptions,
): ClassEvaluation {
  const convention = options.convention ?? 'continuous';
  const at = (iouThreshold: number, rule: MatchOptions['rule']) =>
    matchDetections(groundTruth, detections, { iouThreshold, rule, convention });
  const coco50 = at(0.5, 'coco');
  const pr50 = precisionRecall(coco50);
  const voc = precisionRecall(at(0.5, 'voc'));
  const has = coco50.groundTruthCount > 0;
  const perIou = COCO_IOU_THRESHOLDS.map((t) => (t === 0.5 ? cocoAp(pr50) : cocoAp(precisionRecall(at(t, 'coco')))));
  return {
    groundTruth: coco50.groundTruthCount,
    detections: detections.length,
    ap50: has ? perIou[0] : null,
    ap50to95: has ? perIou.reduce((a, b) => a + b, 0) / perIou.length : null,
    vocAllPointAp50: has ? allPointAp(voc) : null,
    vocElevenPointAp50: has ? elevenPointAp(voc) : null,
    operating: operatingPoint(coco50, options.scoreThreshold),
    curve: interpolatedPrecision101(pr50),
  };
}

/**
 * Precision and recall of the detections a user keeps (score >= threshold). Matching is greedy by score, so the
 * outcome of a kept detection does not depend on the ones dropped below it.
 */
function operatingPoint(match: MatchResult, scoreThreshold: number): ClassEvaluation['operating'] {
  let tp = 0;
  let fp = 0;
  for (let i = 0; i < match.scores.length && match.scores[i] >= scoreThreshold; i++) {
    if (match.ignored[i]) continue;
    if (match.truePositive[i]) tp++;
    else fp++;
  }
  return {
    scoreThreshold,
    truePositives: tp,
    falsePositives: fp,
    precision: tp + fp > 0 ? tp / (tp + fp) : null,
    recall: match.groundTruthCount > 0 ? tp / match.groundTruthCount : null,
  };
}

/** Mean over the classes that have a value (COCO averages only defined classes). */
export function meanDefined(values: readonly (number | null)[]): number | null {
  const v = values.filter((x): x is number => x !== null);
  return v.length > 0 ? v.reduce((a, b) => a + b, 0) / v.length : null;
}
