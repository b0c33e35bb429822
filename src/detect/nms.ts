import { iou } from '../image/geometry.js';
import type { Candidate } from './decode.js';

/**
 * Class-wise greedy non-maximum suppression (common practice, as commonly described, e.g. torchvision's
 * batched_nms documentation, from memory): take boxes from the highest score down; a box is dropped when its IoU
 * with an already kept box of the same class is strictly greater than iouThreshold. Boxes of different classes
 * never suppress each other (a checkbox inside a text entry area is a real, separate element).
 *
 * Returns kept candidates by descending score (ties keep input order), at most maxDetections of them.
 */
export function nonMaxSuppression<T extends Candidate>(candidates: readonly T[], iouThreshold: number, maxDetections: number): T[] {
  const order = candidates
    .map((c, i) => ({ c, i }))
    .sort((a, b) => b.c.score - a.c.score || a.i - b.i)
    .map((e) => e.c);
  const keptByClass = new Map<number, T[]>();
  const kept: T[] = [];
  for (const cand of order) {
    if (kept.length >= maxDetections) break;
    const same = keptByClass.get(cand.classId) ?? [];
    if (same.some((k) => iou(k.box, cand.box) > iouThreshold)) continue;
    same.push(cand);
    keptByClass.set(cand.classId, same);
    kept.push(cand);
  }
  return kept;
}
