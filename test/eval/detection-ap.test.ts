import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { allPointAp, cocoAp, elevenPointAp, evaluateClass, precisionRecall } from '../../src/eval/detection-ap.js';
import { type GroundTruthBox, type ScoredBox, boxIou, matchDetections } from '../../src/eval/detection-match.js';

const here = path.dirname(fileURLToPath(import.meta.url));
const reference = JSON.parse(readFileSync(path.resolve(here, '../fixtures/reference/detection-ap-worked-example.json'), 'utf8')) as {
  iouThreshold: number;
  expected: { truePositives: number; falsePositives: number; finalRecall: number; allPointInterpolatedAP: number; elevenPointInterpolatedAP: number; tolerance: number };
  images: { image: string; groundTruth: number[][]; detections: number[][] }[];
};

// Source: R. Padilla, S. L. Netto, E. A. B. da Silva, "A Survey on Performance Metrics for Object-Detection
// Algorithms", IWSSIP 2020, worked example (data from rafaelpadilla/Object-Detection-Metrics, MIT licence), as
// copied into test/fixtures/reference/detection-ap-worked-example.json: PASCAL VOC matching at IoU 0.3 with the VOC
// devkit's inclusive pixel convention.
describe('published worked example (Padilla et al. 2020)', () => {
  const gts: GroundTruthBox[] = [];
  const dets: ScoredBox[] = [];
  for (const img of reference.images) {
    for (const [x, y, w, h] of img.groundTruth) gts.push({ imageId: img.image, box: { x, y, w, h } });
    for (const [score, x, y, w, h] of img.detections) dets.push({ imageId: img.image, box: { x, y, w, h }, score });
  }
  const match = matchDetections(gts, dets, { iouThreshold: reference.iouThreshold, rule: 'voc', convention: 'inclusive' });
  const pr = precisionRecall(match);
  const e = reference.expected;

  it('counts 7 true and 17 false positives, final recall 0.4667', () => {
    expect(pr.truePositives).toBe(e.truePositives);
    expect(pr.falsePositives).toBe(e.falsePositives);
    expect(pr.recall.at(-1)).toBeCloseTo(e.finalRecall, 4);
  });
  it('all-point interpolated AP 0.2457 and 11-point AP 0.2684', () => {
    expect(Math.abs(allPointAp(pr) - e.allPointInterpolatedAP)).toBeLessThanOrEqual(e.tolerance);
    expect(Math.abs(elevenPointAp(pr) - e.elevenPointInterpolatedAP)).toBeLessThanOrEqual(e.tolerance);
  });
  it('the pixel convention matters, as the reference notes: exclusive areas give other figures', () => {
    const plain = precisionRecall(matchDetections(gts, dets, { iouThreshold: reference.iouThreshold, rule: 'voc', convention: 'continuous' }));
    expect(plain.truePositives).not.toBe(e.truePositives);
  });
});

// Source: COCO detection evaluation definitions (AP = mean of interpolated precision at 101 recall points,
// AP@0.5:0.95 = mean over IoU 0.50:0.05:0.95), cases computed by hand.
describe('COCO AP on hand-made cases', () => {
  const gt = (imageId: number, x: number, y: number): GroundTruthBox => ({ imageId, box: { x, y, w: 20, h: 10 } });
  const det = (imageId: number, x: number, y: number, score: number): ScoredBox => ({ imageId, box: { x, y, w: 20, h: 10 }, score });
  const truth = [gt(1, 0, 0), gt(1, 50, 50), gt(2, 10, 10)];

  it('perfect detections give AP 1 at every IoU', () => {
    const r = evaluateClass(truth, [det(1, 0, 0, 0.9), det(1, 50, 50, 0.8), det(2, 10, 10, 0.7)], { scoreThreshold: 0.25 });
    expect([r.ap50, r.ap50to95, r.vocAllPointAp50, r.vocElevenPointAp50]).toEqual([1, 1, 1, 1]);
    expect(r.operating).toMatchObject({ truePositives: 3, falsePositives: 0, precision: 1, recall: 1 });
  });
  it('no detections give AP 0; a class without ground truth has no AP', () => {
    const r = evaluateClass(truth, [], { scoreThreshold: 0.25 });
    expect([r.ap50, r.ap50to95]).toEqual([0, 0]);
    expect(r.operating.recall).toBe(0);
    expect(evaluateClass([], [det(1, 0, 0, 0.9)], { scoreThreshold: 0.25 }).ap50).toBeNull();
  });
  it('a duplicate counts as a false positive', () => {
    // ranked: A 0.9 (TP: P 1, R 1/2), A-duplicate 0.8 (FP: P 1/2, R 1/2), B 0.7 (TP: P 2/3, R 1).
    // Envelope: 1 for recall ≤ 0.5 (51 of the 101 points: 0.00..0.50), 2/3 for the 50 points above.
    // COCO AP = (51 × 1 + 50 × 2/3) / 101 = 0.834983...; VOC all-point = 0.5 × 1 + 0.5 × 2/3 = 0.8333...
    const two = [gt(1, 0, 0), gt(1, 50, 50)];
    const r = evaluateClass(two, [det(1, 0, 0, 0.9), det(1, 1, 0, 0.8), det(1, 50, 50, 0.7)], { scoreThreshold: 0.25 });
    expect(r.ap50).toBeCloseTo((51 + (50 * 2) / 3) / 101, 10);
    expect(r.vocAllPointAp50).toBeCloseTo(0.5 + (0.5 * 2) / 3, 10);
    expect(r.operating).toMatchObject({ truePositives: 2, falsePositives: 1 });
    expect(r.operating.precision).toBeCloseTo(2 / 3, 10);
  });
  it('a box good at IoU 0.5 but not at stricter thresholds lowers AP@0.5:0.95 only', () => {
    // detection shifted 4 px along a 20-px width: ∩ 16×10 = 160, ∪ 200 + 200 − 160 = 240, IoU 2/3:
    // a true positive at IoU 0.50, 0.55, 0.60, 0.65 (4 of 10 thresholds) → AP@0.5:0.95 = 4/10
    const one = [gt(1, 0, 0)];
    expect(boxIou({ x: 4, y: 0, w: 20, h: 10 }, one[0].box, 'continuous')).toBeCloseTo(2 / 3, 12);
    const r = evaluateClass(one, [det(1, 4, 0, 0.9)], { scoreThreshold: 0.25 });
    expect(r.ap50).toBe(1);
    expect(r.ap50to95).toBeCloseTo(0.4, 12);
  });
  it('the operating threshold leaves lower-scored detections out of precision and recall', () => {
    const r = evaluateClass(truth, [det(1, 0, 0, 0.9), det(1, 50, 50, 0.2), det(2, 80, 80, 0.5)], { scoreThreshold: 0.25 });
    expect(r.operating).toMatchObject({ truePositives: 1, falsePositives: 1, precision: 0.5 });
    expect(r.operating.recall).toBeCloseTo(1 / 3, 12);
  });
  it('a detection matching only a crowd region is ignored, not a false positive', () => {
    const withCrowd: GroundTruthBox[] = [gt(1, 0, 0), { imageId: 1, box: { x: 100, y: 100, w: 100, h: 100 }, crowd: true }];
    const m = matchDetections(withCrowd, [det(1, 0, 0, 0.9), det(1, 120, 120, 0.8)], { iouThreshold: 0.5, rule: 'coco', convention: 'continuous' });
    expect(m.ignored).toEqual([false, true]);
    expect(cocoAp(precisionRecall(m))).toBe(1);
  });
});
