"""Labeled pages: read a COCO directory written by `formglean samples generate`, fit each page into
the model input once (cached as .npz beside the data), and letterbox pages for the model.

Box convention: COCO [x, y, w, h] in page pixels, continuous coordinates (a box covers x..x+w);
inside training everything is [x1, y1, x2, y2] in input pixels.
"""

from __future__ import annotations

import json
import os
import sys
from dataclasses import dataclass

import numpy as np
from PIL import Image

from model import CLASS_NAMES, INPUT_H, INPUT_W

# Page-to-input resampling filters seen in training, so the model does not depend on the one the
# runtime happens to use (sharp, PIL and browsers differ).
RESAMPLERS = [Image.BOX, Image.BILINEAR, Image.LANCZOS, Image.HAMMING]
CACHE_VERSION = 1


class DataError(Exception):
    """A one-line problem with a data file; the message names the file."""


@dataclass
class PageSet:
    """Pages fitted to the model input: images[i] is uint8 [h, w] (h <= INPUT_H, w <= INPUT_W)."""

    name: str
    images: list[np.ndarray]
    boxes: list[np.ndarray]  # float32 [n, 4] x1 y1 x2 y2 in fitted-page pixels
    classes: list[np.ndarray]  # int64 [n] in 0..C-1
    page_sizes: list[tuple[int, int]]  # original (width, height)
    file_names: list[str]
    scales: list[float]  # fitted / original


def read_coco(directory: str) -> tuple[list[dict], dict[int, list[tuple[list[float], int]]]]:
    """Images and per-image (bbox, class index) lists, with class ids mapped by category name."""
    path = os.path.join(directory, "coco.json")
    try:
        with open(path, "r", encoding="utf-8") as fh:
            coco = json.load(fh)
    except FileNotFoundError:
        raise DataError(f"{path}: no such file (generate pages with `formglean samples generate`)") from None
    except json.JSONDecodeError as err:
        raise DataError(f"{path}: not valid JSON ({err.msg} at line {err.lineno})") from None
    for key in ("images", "annotations", "categories"):
        if not isinstance(coco.get(key), list):
            raise DataError(f"{path}: expected a '{key}' array")
    by_category: dict[int, int] = {}
    for cat in coco["categories"]:
        name = cat.get("name")
        if name not in CLASS_NAMES:
            raise DataError(f"{path}: category '{name}' is not one of {', '.join(CLASS_NAMES)}")
        by_category[int(cat["id"])] = CLASS_NAMES.index(name)
    per_image: dict[int, list[tuple[list[float], int]]] = {int(im["id"]): [] for im in coco["images"]}
    for ann in coco["annotations"]:
        image_id = int(ann["image_id"])
        if image_id not in per_image:
            raise DataError(f"{path}: annotation {ann.get('id')} names unknown image {image_id}")
        cat = int(ann["category_id"])
        if cat not in by_category:
            raise DataError(f"{path}: annotation {ann.get('id')} names unknown category {cat}")
        bbox = [float(v) for v in ann["bbox"]]
        if len(bbox) != 4 or bbox[2] <= 0 or bbox[3] <= 0:
            raise DataError(f"{path}: annotation {ann.get('id')} has a bad bbox {ann['bbox']}")
        per_image[image_id].append((bbox, by_category[cat]))
    return coco["images"], per_image


def fit_scale(width: int, height: int) -> float:
    """Scale that fits a page inside the model input, keeping its aspect ratio."""
    return min(INPUT_W / width, INPUT_H / height)


def load_gray(path: str) -> Image.Image:
    try:
        with Image.open(path) as im:
            return im.convert("L")
    except FileNotFoundError:
        raise DataError(f"{path}: no such file") from None
    except OSError as err:
        raise DataError(f"{path}: cannot decode image ({err})") from None


def load_page_set(directory: str, log=print) -> PageSet:
    """Load a COCO directory, building (or reusing) its fitted-page cache."""
    coco_path = os.path.join(directory, "coco.json")
    images_meta, per_image = read_coco(directory)
    cache_path = os.path.join(directory, f"fitted-{INPUT_W}x{INPUT_H}.npz")
    stamp = f"v{CACHE_VERSION}:{os.path.getmtime(coco_path)}:{len(images_meta)}"
    if os.path.exists(cache_path):
        cached = np.load(cache_path, allow_pickle=False)
        if str(cached["stamp"]) == stamp:
            return _from_cache(directory, cached, images_meta, per_image)
    log(f"fitting {len(images_meta)} pages of {directory} to {INPUT_W}x{INPUT_H}")
    fitted: list[np.ndarray] = []
    for index, meta in enumerate(images_meta):
        im = load_gray(os.path.join(directory, meta["file_name"]))
        width, height = im.size
        s = fit_scale(width, height)
        size = (max(1, round(width * s)), max(1, round(height * s)))
        # Deterministic choice of filter per page (index-seeded) keeps the cache reproducible.
        resample = RESAMPLERS[index % len(RESAMPLERS)]
        fitted.append(np.asarray(im.resize(size, resample), dtype=np.uint8))
    shapes = np.array([a.shape for a in fitted], dtype=np.int64).reshape(-1, 2)
    flat = np.concatenate([a.reshape(-1) for a in fitted]) if fitted else np.zeros(0, np.uint8)
    tmp = cache_path + f".{os.getpid()}.tmp.npz"
    np.savez(tmp, stamp=np.array(stamp), shapes=shapes, flat=flat)
    os.replace(tmp, cache_path)
    return _from_cache(directory, np.load(cache_path, allow_pickle=False), images_meta, per_image)


def _from_cache(directory, cached, images_meta, per_image) -> PageSet:
    shapes = cached["shapes"]
    flat = cached["flat"]
    images, boxes, classes, sizes, names, scales = [], [], [], [], [], []
    offset = 0
    for meta, (h, w) in zip(images_meta, shapes):
        n = int(h) * int(w)
        images.append(flat[offset : offset + n].reshape(int(h), int(w)))
        offset += n
        width, height = int(meta["width"]), int(meta["height"])
        s = fit_scale(width, height)
        anns = per_image[int(meta["id"])]
        b = np.array([a[0] for a in anns], dtype=np.float32).reshape(-1, 4)
        b[:, 2:] += b[:, :2]
        boxes.append(b * s)
        classes.append(np.array([a[1] for a in anns], dtype=np.int64))
        sizes.append((width, height))
        names.append(meta["file_name"])
        scales.append(s)
    return PageSet(os.path.basename(os.path.normpath(directory)), images, boxes, classes, sizes, names, scales)


def letterbox(page: np.ndarray) -> np.ndarray:
    """Evaluation letterbox: a fitted page placed at the top-left of a white canvas, as float 0..1."""
    canvas = np.full((INPUT_H, INPUT_W), 255, dtype=np.uint8)
    canvas[: page.shape[0], : page.shape[1]] = page
    return canvas.astype(np.float32) / 255.0


def fail(err: Exception) -> None:
    """Print a one-line error and exit with status 2 (bad input), as the CLI does."""
    sys.stderr.write(f"{os.path.basename(sys.argv[0])}: {' '.join(str(err).split())}\n")
    sys.exit(2)
