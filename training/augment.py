"""Training-time page composition: random letterbox scale, placement, padding and photometric jitter.

The generator already draws scan damage (rotation, blur, noise, JPEG); here we only vary what the
runtime's letterbox and a different scanner's exposure would change.
"""

from __future__ import annotations

import numpy as np
from PIL import Image

from model import INPUT_H, INPUT_W
from pages import RESAMPLERS

# Boxes smaller than this (input pixels) after scaling are dropped: below one quarter of a stride-4
# cell nothing can be located (common practice: drop degenerate boxes after augmentation).
MIN_BOX_SIDE = 1.0


def compose(page: np.ndarray, boxes: np.ndarray, classes: np.ndarray, rng: np.random.Generator):
    """Returns (image float32 [H, W] 0..1, boxes [n, 4] input pixels, classes [n])."""
    h, w = page.shape
    img = page
    scale = 1.0
    if rng.random() < 0.5:
        # Smaller pages in the frame: the runtime may get pages of other aspect ratios.
        scale = float(rng.uniform(0.6, 1.0))
        size = (max(8, round(w * scale)), max(8, round(h * scale)))
        resample = RESAMPLERS[int(rng.integers(len(RESAMPLERS)))]
        img = np.asarray(Image.fromarray(page).resize(size, resample), dtype=np.uint8)
        scale_x, scale_y = size[0] / w, size[1] / h
    else:
        scale_x = scale_y = 1.0
    ph, pw = img.shape
    placement = rng.random()
    if placement < 0.4:
        ox, oy = 0, 0  # top-left letterbox
    elif placement < 0.7:
        ox, oy = (INPUT_W - pw) // 2, (INPUT_H - ph) // 2  # centred letterbox
    else:
        ox, oy = int(rng.integers(0, INPUT_W - pw + 1)), int(rng.integers(0, INPUT_H - ph + 1))
    pad = 255 if rng.random() < 0.7 else int(rng.integers(100, 256))
    canvas = np.full((INPUT_H, INPUT_W), pad, dtype=np.float32)
    page_f = img.astype(np.float32)
    if rng.random() < 0.6:
        contrast = rng.uniform(0.7, 1.15)
        brightness = rng.uniform(-25.0, 25.0)
        page_f = (page_f - 128.0) * contrast + 128.0 + brightness
    if rng.random() < 0.25:
        page_f = page_f + rng.normal(0.0, rng.uniform(2.0, 10.0), page_f.shape).astype(np.float32)
    canvas[oy : oy + ph, ox : ox + pw] = page_f
    canvas = np.clip(canvas, 0.0, 255.0) / 255.0

    b = boxes.copy()
    b[:, [0, 2]] = b[:, [0, 2]] * scale_x + ox
    b[:, [1, 3]] = b[:, [1, 3]] * scale_y + oy
    b[:, [0, 2]] = np.clip(b[:, [0, 2]], 0, INPUT_W)
    b[:, [1, 3]] = np.clip(b[:, [1, 3]], 0, INPUT_H)
    keep = ((b[:, 2] - b[:, 0]) >= MIN_BOX_SIDE) & ((b[:, 3] - b[:, 1]) >= MIN_BOX_SIDE)
    return canvas.astype(np.float32), b[keep], classes[keep]
