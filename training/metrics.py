"""Detection metrics in numpy: per-class NMS, IoU matching, AP.

Conventions: continuous pixel coordinates (area = w * h, no "+1"), as the COCO evaluation uses.
AP@0.5 uses all-point interpolation of the precision envelope (PASCAL VOC 2010+ definition);
AP@0.5:0.95 averages 101-point interpolated AP over IoU 0.50:0.05:0.95 (COCO definition).
A detection matches the highest-IoU unmatched ground truth of its class and image at or above the
IoU threshold, taking detections in descending score order; a duplicate is a false positive.
"""

from __future__ import annotations

import numpy as np


def iou_matrix(a: np.ndarray, b: np.ndarray, inclusive: bool = False) -> np.ndarray:
    """IoU of every box in a [n, 4] with every box in b [m, 4] (x1 y1 x2 y2). inclusive=True counts pixels as the
    PASCAL VOC devkit does (a box x1..x2 covers x2 - x1 + 1 pixels); only the published worked example needs it."""
    one = 1.0 if inclusive else 0.0
    if len(a) == 0 or len(b) == 0:
        return np.zeros((len(a), len(b)), dtype=np.float64)
    ix1 = np.maximum(a[:, None, 0], b[None, :, 0])
    iy1 = np.maximum(a[:, None, 1], b[None, :, 1])
    ix2 = np.minimum(a[:, None, 2], b[None, :, 2])
    iy2 = np.minimum(a[:, None, 3], b[None, :, 3])
    inter = np.clip(ix2 - ix1 + one, 0, None) * np.clip(iy2 - iy1 + one, 0, None)
    area_a = (a[:, 2] - a[:, 0] + one) * (a[:, 3] - a[:, 1] + one)
    area_b = (b[:, 2] - b[:, 0] + one) * (b[:, 3] - b[:, 1] + one)
    return inter / np.maximum(area_a[:, None] + area_b[None, :] - inter, 1e-9)


def non_max_suppression(boxes: np.ndarray, scores: np.ndarray, iou_threshold: float) -> np.ndarray:
    """Greedy NMS; returns kept indices in descending score order."""
    order = np.argsort(-scores, kind="stable")
    keep = []
    while len(order):
        i = order[0]
        keep.append(i)
        if len(order) == 1:
            break
        ious = iou_matrix(boxes[i : i + 1], boxes[order[1:]])[0]
        order = order[1:][ious <= iou_threshold]
    return np.array(keep, dtype=np.int64)


def match(dets: list[tuple[int, float, np.ndarray]], gts: dict[int, np.ndarray], iou_threshold: float, inclusive: bool = False):
    """dets: (image, score, box) of one class; gts: image -> [m, 4]. Returns (scores, tp flags) sorted
    by descending score, and the number of ground-truth boxes."""
    order = sorted(range(len(dets)), key=lambda k: -dets[k][1])
    used = {img: np.zeros(len(g), dtype=bool) for img, g in gts.items()}
    scores = np.array([dets[k][1] for k in order], dtype=np.float64)
    tp = np.zeros(len(order), dtype=bool)
    for rank, k in enumerate(order):
        img, _, box = dets[k]
        g = gts.get(img)
        if g is None or len(g) == 0:
            continue
        ious = iou_matrix(box[None, :], g, inclusive)[0]
        ious[used[img]] = -1.0
        best = int(np.argmax(ious))
        if ious[best] >= iou_threshold:
            used[img][best] = True
            tp[rank] = True
    total = sum(len(g) for g in gts.values())
    return scores, tp, total


def average_precision(tp: np.ndarray, total: int, points: int | None = None) -> float:
    """AP from tp flags in descending score order. points=None: all-point; 101: COCO; 11: VOC 2007."""
    if total == 0:
        return float("nan")
    if len(tp) == 0:
        return 0.0
    ctp = np.cumsum(tp)
    cfp = np.cumsum(~tp)
    recall = ctp / total
    precision = ctp / np.maximum(ctp + cfp, 1e-12)
    # Precision envelope: the best precision at any recall at least this high.
    envelope = np.maximum.accumulate(precision[::-1])[::-1]
    if points is None:
        r = np.concatenate([[0.0], recall])
        return float(np.sum((r[1:] - r[:-1]) * envelope))
    sampled = []
    for level in np.linspace(0.0, 1.0, points):
        idx = np.searchsorted(recall, level, side="left")
        sampled.append(envelope[idx] if idx < len(envelope) else 0.0)
    return float(np.mean(sampled))
