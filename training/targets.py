"""Which grid cells learn which box.

A cell is positive for a box when its centre lies inside the box and near the box centre: within
a central window of +-(25 % of the box side), at least 1.5 cells and at most 4 cells each way. The
cell holding the box centre is always positive so that a 10-pixel checkbox still gets a cell.
Where boxes overlap, the smaller box wins the cell (it is the harder one to find).
The cap keeps long fields from outvoting small checkboxes in the loss.
"""

from __future__ import annotations

import numpy as np

from model import INPUT_H, INPUT_W, STRIDE

GRID_W = INPUT_W // STRIDE
GRID_H = INPUT_H // STRIDE
WINDOW_FRACTION = 0.25
WINDOW_MIN = 1.5 * STRIDE
WINDOW_MAX = 4.0 * STRIDE


def assign(boxes: np.ndarray, classes: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """boxes [n, 4] x1 y1 x2 y2 (input pixels) -> (class per cell int64 [GRID_H*GRID_W], -1 = background;
    target box per cell float32 [GRID_H*GRID_W, 4]; cells its box holds, per cell, float32, 0 = background)."""
    cls_map = np.full((GRID_H, GRID_W), -1, dtype=np.int64)
    box_map = np.zeros((GRID_H, GRID_W, 4), dtype=np.float32)
    owner = np.full((GRID_H, GRID_W), -1, dtype=np.int64)
    if len(boxes):
        areas = (boxes[:, 2] - boxes[:, 0]) * (boxes[:, 3] - boxes[:, 1])
        for k in np.argsort(-areas):  # largest first, so smaller boxes overwrite
            x1, y1, x2, y2 = boxes[k]
            cx, cy = (x1 + x2) / 2, (y1 + y2) / 2
            rx = np.clip(WINDOW_FRACTION * (x2 - x1), WINDOW_MIN, WINDOW_MAX)
            ry = np.clip(WINDOW_FRACTION * (y2 - y1), WINDOW_MIN, WINDOW_MAX)
            lo_x, hi_x = max(x1, cx - rx), min(x2, cx + rx)
            lo_y, hi_y = max(y1, cy - ry), min(y2, cy + ry)
            # Cells j whose centre (j + 0.5) * STRIDE lies in [lo, hi].
            j0 = int(np.ceil(lo_x / STRIDE - 0.5))
            j1 = int(np.floor(hi_x / STRIDE - 0.5))
            i0 = int(np.ceil(lo_y / STRIDE - 0.5))
            i1 = int(np.floor(hi_y / STRIDE - 0.5))
            jc = min(GRID_W - 1, max(0, int(cx // STRIDE)))
            ic = min(GRID_H - 1, max(0, int(cy // STRIDE)))
            j0, j1 = min(max(j0, 0), jc), max(min(j1, GRID_W - 1), jc)
            i0, i1 = min(max(i0, 0), ic), max(min(i1, GRID_H - 1), ic)
            cls_map[i0 : i1 + 1, j0 : j1 + 1] = classes[k]
            box_map[i0 : i1 + 1, j0 : j1 + 1] = boxes[k]
            owner[i0 : i1 + 1, j0 : j1 + 1] = k
    owner = owner.reshape(-1)
    cells = np.zeros(owner.shape, dtype=np.float32)
    held = owner >= 0
    if held.any():
        cells[held] = np.bincount(owner[held], minlength=len(boxes))[owner[held]]
    return cls_map.reshape(-1), box_map.reshape(-1, 4), cells
