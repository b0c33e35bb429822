"""Evaluate a QuireNet checkpoint on COCO directories of generated pages.

  /usr/bin/python3 training/evaluate.py --checkpoint training/runs/main/final.pt \
      --data training/data/eval-clinic-intake training/data/eval-marina-slip --out report.json

Pages are letterboxed the way the shipped runtime does (fit, top-left, white padding), run through
the same decode as the exported graph, reduced by per-class NMS and scored in page pixels.
Prints per-class AP@0.5, AP@0.5:0.95, and precision/recall at the operating threshold.
"""

from __future__ import annotations

import cpu_sharing  # noqa: F401  (must precede torch)
import argparse
import json
import os
import sys
import time

import numpy as np
import torch

from metrics import average_precision, match, non_max_suppression
from model import CLASS_NAMES, QuireNet, decode
from pages import DataError, PageSet, fail, letterbox, load_page_set

# Score kept before NMS when computing AP: low, so the precision-recall curve reaches high recall.
AP_SCORE_FLOOR = 0.02
# NMS IoU within a class (common practice for single-class-per-box detectors: 0.5).
NMS_IOU = 0.5
# Cap per page: our densest generated forms hold well under 300 entry areas.
MAX_PER_PAGE = 300
IOU_THRESHOLDS = np.linspace(0.5, 0.95, 10)


def detect_pages(net: QuireNet, pages: PageSet, batch: int = 8):
    """Yields (page index, boxes [k, 4] page pixels x1y1x2y2, scores [k], classes [k]) after NMS."""
    net.eval()
    with torch.no_grad():
        for start in range(0, len(pages.images), batch):
            idx = list(range(start, min(start + batch, len(pages.images))))
            x = torch.from_numpy(np.stack([letterbox(pages.images[i]) for i in idx]))[:, None]
            x = x.contiguous(memory_format=torch.channels_last)
            out = decode(*net(x)).numpy()  # [b, 4 + C, N]
            for row, i in enumerate(idx):
                yield (i, *postprocess(out[row], pages.scales[i], AP_SCORE_FLOOR))


def postprocess(out: np.ndarray, scale: float, score_floor: float):
    """[4 + C, N] decoded output -> page-pixel boxes, scores, classes after per-class NMS.
    Each cell keeps only its best class (single-label decoding), as the runtime in src/detect does."""
    boxes_cxcywh = out[:4].T
    class_scores = out[4:].T
    best = class_scores.argmax(axis=1)
    best_score = class_scores[np.arange(len(best)), best]
    sel = np.nonzero(best_score >= score_floor)[0]
    boxes = np.concatenate([boxes_cxcywh[sel, :2] - boxes_cxcywh[sel, 2:] / 2, boxes_cxcywh[sel, :2] + boxes_cxcywh[sel, 2:] / 2], axis=1)
    scores, classes = best_score[sel], best[sel]
    kept = []
    for c in np.unique(classes):
        idx = np.nonzero(classes == c)[0]
        kept.append(idx[non_max_suppression(boxes[idx], scores[idx], NMS_IOU)])
    if not kept:
        return np.zeros((0, 4)), np.zeros(0), np.zeros(0, dtype=np.int64)
    keep = np.concatenate(kept)
    keep = keep[np.argsort(-scores[keep], kind="stable")][:MAX_PER_PAGE]
    return boxes[keep] / scale, scores[keep], classes[keep]


def collect(net: QuireNet, page_set: PageSet) -> list[tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]]:
    """Per page: (detected boxes, scores, classes, ground-truth boxes, ground-truth classes), page pixels."""
    records = []
    for i, boxes, scores, classes in detect_pages(net, page_set):
        records.append((boxes, scores, classes, page_set.boxes[i] / page_set.scales[i], page_set.classes[i]))
    return records


def score(records: list, threshold: float) -> dict:
    """Per-class AP and precision/recall at the threshold over the pages in records."""
    per_class = {}
    for c, name in enumerate(CLASS_NAMES):
        dets, gts = [], {}
        for key, (boxes, scores, classes, gt_boxes, gt_classes) in enumerate(records):
            gts[key] = gt_boxes[gt_classes == c]
            dets.extend((key, float(s), b) for b, s in zip(boxes[classes == c], scores[classes == c]))
        scores_sorted, tp, total = match(dets, gts, 0.5)
        at = scores_sorted >= threshold
        tp_at = int(tp[at].sum())
        ap_coco = [average_precision(match(dets, gts, t)[1], total, points=101) for t in IOU_THRESHOLDS]
        per_class[name] = {
            "ground_truth": total,
            "ap50": average_precision(tp, total),
            "ap50_95": float(np.mean(ap_coco)) if total else float("nan"),
            "recall_at_threshold": tp_at / total if total else float("nan"),
            "precision_at_threshold": tp_at / max(1, int(at.sum())),
        }
    return {"pages": len(records), "threshold": threshold, "classes": per_class}


def format_report(report: dict) -> str:
    lines = [f"{'class':<16}{'gt':>6}{'AP50':>8}{'AP50:95':>9}{'P@thr':>8}{'R@thr':>8}"]
    for name, m in report["classes"].items():
        lines.append(
            f"{name:<16}{m['ground_truth']:>6}{m['ap50']:>8.4f}{m['ap50_95']:>9.4f}"
            f"{m['precision_at_threshold']:>8.4f}{m['recall_at_threshold']:>8.4f}"
        )
    lines.append(f"pages {report['pages']}, threshold {report['threshold']}")
    return "\n".join(lines)


def load_checkpoint(path: str) -> QuireNet:
    try:
        state = torch.load(path, map_location="cpu")
    except FileNotFoundError:
        raise DataError(f"{path}: no such checkpoint") from None
    except Exception as err:  # torch raises several kinds for a damaged file
        raise DataError(f"{path}: not a training checkpoint ({err})") from None
    if not isinstance(state, dict) or "model" not in state:
        raise DataError(f"{path}: not a training checkpoint (no 'model' entry)")
    net = QuireNet(width=state.get("width", 24))
    net.load_state_dict(state["model"])
    return net.to(memory_format=torch.channels_last).eval()


def main(argv: list[str]) -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--checkpoint", required=True)
    parser.add_argument("--data", nargs="+", required=True, help="COCO directories from `formglean samples generate`")
    parser.add_argument("--threshold", type=float, default=0.3, help="operating score threshold")
    parser.add_argument("--threads", type=int, default=2)
    parser.add_argument("--sweep", type=float, nargs="*", default=[], help="also print precision/recall over all pages at these thresholds")
    parser.add_argument("--out", help="write the report as JSON here")
    args = parser.parse_args(argv)
    torch.set_num_threads(args.threads)
    try:
        net = load_checkpoint(args.checkpoint)
        sets = [load_page_set(d) for d in args.data]
    except DataError as err:
        fail(err)
    reports, everything = {}, []
    for d, s in zip(args.data, sets):
        started = time.time()
        records = collect(net, s)
        reports[d] = score(records, args.threshold)
        reports[d]["seconds_per_page_torch"] = (time.time() - started) / max(1, len(records))
        everything.extend(records)
        print(f"== {d}\n{format_report(reports[d])}", flush=True)
    if len(sets) > 1:
        reports["all"] = score(everything, args.threshold)
        print(f"== all\n{format_report(reports['all'])}")
    for t in args.sweep:
        m = score(everything, t)["classes"]
        print(f"threshold {t:.2f}: " + "  ".join(f"{n} P {v['precision_at_threshold']:.3f} R {v['recall_at_threshold']:.3f}" for n, v in m.items()))
    if args.out:
        tmp = f"{args.out}.{os.getpid()}.tmp"
        with open(tmp, "w", encoding="utf-8") as fh:
            json.dump(reports, fh, indent=2)
        os.replace(tmp, args.out)


if __name__ == "__main__":
    main(sys.argv[1:])
