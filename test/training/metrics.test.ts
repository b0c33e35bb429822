import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { PYTHON, missingPythonModules, skipUnlessPresent } from '../support/requirements.js';

// The model card's numbers come from training/evaluate.py, so its matching and AP code (training/metrics.py) is
// checked against the same outside references as the TypeScript evaluator.
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const referenceFile = path.join(root, 'test/fixtures/reference/detection-ap-worked-example.json');

const SCRIPT = `
import json, sys
sys.path.insert(0, 'training')
import numpy as np
from metrics import average_precision, match, non_max_suppression

def xyxy(l, t, w, h):
    return np.array([l, t, l + w, t + h], dtype=np.float64)

ref = json.load(open(sys.argv[1]))
dets, gts = [], {}
for im in ref["images"]:
    gts[im["image"]] = np.array([xyxy(*g) for g in im["groundTruth"]]).reshape(-1, 4)
    dets.extend((im["image"], d[0], xyxy(*d[1:])) for d in im["detections"])
scores, tp, total = match(dets, gts, ref["iouThreshold"], inclusive=True)
out = {"tp": int(tp.sum()), "fp": int((~tp).sum()), "recall": float(tp.sum() / total),
       "ap": average_precision(tp, total), "ap11": average_precision(tp, total, points=11)}

# Hand-made cases for the COCO definition (101-point interpolation, continuous pixels).
g = {0: np.array([xyxy(10, 10, 20, 20), xyxy(50, 50, 10, 10)])}
perfect = [(0, 0.9, xyxy(10, 10, 20, 20)), (0, 0.8, xyxy(50, 50, 10, 10))]
out["perfect"] = average_precision(match(perfect, g, 0.5)[1], 2, points=101)
out["none"] = average_precision(match([], g, 0.5)[1], 2, points=101)
dup = [(0, 0.9, xyxy(10, 10, 20, 20)), (0, 0.85, xyxy(10, 10, 20, 20)), (0, 0.8, xyxy(50, 50, 10, 10))]
out["duplicate_tp"] = [bool(x) for x in match(dup, g, 0.5)[1]]
out["duplicate_ap"] = average_precision(match(dup, g, 0.5)[1], 2, points=101)
boxes = np.array([xyxy(0, 0, 10, 10), xyxy(1, 0, 10, 10), xyxy(30, 30, 10, 10)])
out["nms"] = non_max_suppression(boxes, np.array([0.9, 0.8, 0.7]), 0.5).tolist()
print(json.dumps(out))
`;

// training/metrics.py needs numpy only.
const missing = missingPythonModules(['numpy']);

function runMetrics(): Record<string, unknown> {
  const run = spawnSync(PYTHON, ['-c', SCRIPT, referenceFile], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  if (run.status !== 0) throw new Error(`${PYTHON} metrics check exited ${run.status}: ${(run.stderr ?? run.error?.message ?? '').trim().split('\n').slice(-2).join(' | ')}`);
  return JSON.parse(run.stdout);
}

describe('training/metrics.py', () => {
  const out = missing === null ? runMetrics() : {};

  it('reproduces the published worked example (Padilla et al. 2020)', (ctx) => {
    skipUnlessPresent(ctx, missing);
    // Source: R. Padilla, S. L. Netto, E. A. B. da Silva, "A Survey on Performance Metrics for Object-Detection
    // Algorithms", IWSSIP 2020 (data: rafaelpadilla/Object-Detection-Metrics, MIT licence), copied into
    // test/fixtures/reference/detection-ap-worked-example.json: IoU 0.3, VOC devkit inclusive pixels;
    // 7 TP, 17 FP, recall 0.4667, all-point AP 0.2457, 11-point AP 0.2684 (tolerance 0.0005 as the file states).
    expect(out.tp).toBe(7);
    expect(out.fp).toBe(17);
    expect(Math.abs((out.recall as number) - 0.4667)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs((out.ap as number) - 0.2457)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs((out.ap11 as number) - 0.2684)).toBeLessThanOrEqual(0.0005);
  });

  it('follows the COCO definitions on hand-made cases', (ctx) => {
    skipUnlessPresent(ctx, missing);
    // COCO detection evaluation (cocodataset.org "Detection Evaluation", pycocotools cocoeval.py, from memory):
    // 101-point interpolated precision; perfect detections give AP 1, none give 0, and a second detection of an
    // already matched box is a false positive.
    expect(out.perfect).toBeCloseTo(1, 10);
    expect(out.none).toBe(0);
    expect(out.duplicate_tp).toEqual([true, false, true]);
    // Recall 0.5 at precision 1, then recall 1 at precision 2/3: envelope 1 for r <= 0.5 (51 points), 2/3 after (50).
    expect(out.duplicate_ap).toBeCloseTo((51 * 1 + 50 * (2 / 3)) / 101, 10);
    // Greedy NMS (common practice): the 0.8 box overlaps the 0.9 box by IoU 90/110 = 0.82 > 0.5 and is dropped.
    expect(out.nms).toEqual([0, 2]);
  });
});
