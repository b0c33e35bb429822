"""Form-cell rendering for the digit reader: glyph banks and batched, seeded augmentation in torch.

Everything the runtime does to a cell (src/read/digit-cell.ts) is mirrored here, in the same order:
  1. the cell's grayscale pixels -> ink 0..1 by per-cell normalisation: paper = 90th percentile, dark = 2nd
     percentile, ink = clamp((paper - v) / max(paper - dark, MIN_CONTRAST), 0, 1);
  2. the cell is fitted into INPUT x INPUT keeping its aspect ratio, centred, padded with ink 0.
Training draws cells on a CANVAS x CANVAS work canvas (about a comb cell at 200 DPI) and pools by 2.
"""

from __future__ import annotations

import glob
import math
import os
import struct

import numpy as np
import torch
import torch.nn.functional as F
from PIL import Image, ImageDraw, ImageFont

INPUT = 32
CANVAS = 64
PAPER_PERCENTILE = 0.9
DARK_PERCENTILE = 0.02
# Below this paper-to-dark difference (8-bit levels) a cell is treated as low-contrast: its noise is not stretched
# into strokes. 80 levels: the weakest pencil strokes in the scan simulation sit ~90 levels under the paper.
MIN_CONTRAST = 80.0

CLASS_NAMES = [str(d) for d in range(10)] + ["empty", "not_digit"]
EMPTY, NOT_DIGIT = 10, 11

# Letters that a person's hand makes look like a digit are left out of the "not a digit" class: O o D Q (0),
# I l i j J (1), Z z (2), S s (5), b G (6), T (7), B (8), g q (9), and A y (4) (common practice in digit-only
# recognisers: such letters are what the digit is mistaken for, not evidence against it).
CONFUSABLE = set("OoDQIlijJZzSsbGTBgqAy")
LETTERS = [c for c in "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz" if c not in CONFUSABLE]
SYMBOLS = list("/-+X?#*&@%=<>")


def read_digits(path: str) -> tuple[np.ndarray, np.ndarray]:
    """training/digits/export_mnist.ts's file: (images uint8 [N, 28, 28] ink 0..255, labels int64 [N])."""
    with open(path, "rb") as fh:
        data = fh.read()
    if data[:4] != b"FGD1":
        raise SystemExit(f"{path}: not a digits file (run npx tsx training/digits/export_mnist.ts)")
    (count,) = struct.unpack_from("<I", data, 4)
    rec = 3 + 28 * 28
    arr = np.frombuffer(data, dtype=np.uint8, count=count * rec, offset=8).reshape(count, rec)
    return arr[:, 3:].reshape(count, 28, 28).copy(), arr[:, 0].astype(np.int64)


def _fit28(img: np.ndarray) -> np.ndarray:
    """A glyph (ink array) scaled into a 20 x 20 box and centred in 28 x 28, the MNIST convention."""
    ys, xs = np.nonzero(img > 20)
    if len(ys) == 0:
        return np.zeros((28, 28), np.uint8)
    crop = img[ys.min() : ys.max() + 1, xs.min() : xs.max() + 1]
    h, w = crop.shape
    s = 20.0 / max(h, w)
    nh, nw = max(1, round(h * s)), max(1, round(w * s))
    small = np.asarray(Image.fromarray(crop).resize((nw, nh), Image.BILINEAR))
    out = np.zeros((28, 28), np.uint8)
    y0, x0 = (28 - nh) // 2, (28 - nw) // 2
    out[y0 : y0 + nh, x0 : x0 + nw] = small
    return out


def font_files(root: str) -> list[str]:
    nm = os.path.join(root, "node_modules")
    files = [
        os.path.join(nm, "dejavu-fonts-ttf/ttf", f)
        for f in ["DejaVuSans.ttf", "DejaVuSans-Bold.ttf", "DejaVuSerif.ttf", "DejaVuSansMono.ttf", "DejaVuSansCondensed-Oblique.ttf"]
    ]
    files += sorted(glob.glob(os.path.join(nm, "@expo-google-fonts/caveat/*/Caveat_*.ttf")))
    files += sorted(glob.glob(os.path.join(nm, "@expo-google-fonts/nanum-pen-script/*/*.ttf")))
    return [f for f in files if os.path.exists(f)]


def render_glyphs(chars: list[str], fonts: list[str]) -> np.ndarray:
    out = []
    for path in fonts:
        font = ImageFont.truetype(path, 80)
        for ch in chars:
            im = Image.new("L", (140, 140), 0)
            ImageDraw.Draw(im).text((30, 10), ch, fill=255, font=font)
            out.append(_fit28(np.asarray(im)))
    return np.stack(out)


def draw_marks(rng: np.random.Generator, n: int) -> np.ndarray:
    """Pen marks that are not digits: ticks, crosses, dashes, slashes, scribbles, dots, circles-with-strokes."""
    out = []
    for _ in range(n):
        im = Image.new("L", (56, 56), 0)
        d = ImageDraw.Draw(im)
        w = int(rng.integers(2, 6))
        kind = rng.integers(0, 6)
        if kind == 0:  # tick
            d.line([(8, 30), (22, 46), (48, 8)], fill=255, width=w)
        elif kind == 1:  # cross
            d.line([(8, 8), (48, 48)], fill=255, width=w)
            d.line([(48, 8), (8, 48)], fill=255, width=w)
        elif kind == 2:  # dash or long slash
            a = rng.uniform(-0.5, 0.5) if rng.random() < 0.5 else rng.uniform(0.8, 1.3)
            c, r = 28, rng.uniform(12, 26)
            d.line([(c - r * math.cos(a), c + r * math.sin(a)), (c + r * math.cos(a), c - r * math.sin(a))], fill=255, width=w)
        elif kind == 3:  # scribble
            pts = [(float(rng.uniform(6, 50)), float(rng.uniform(6, 50))) for _ in range(int(rng.integers(4, 9)))]
            d.line(pts, fill=255, width=w, joint="curve")
        elif kind == 4:  # blot
            r = rng.uniform(8, 20)
            d.ellipse([28 - r, 28 - r * rng.uniform(0.5, 1), 28 + r, 28 + r * rng.uniform(0.5, 1)], fill=255)
        else:  # hatching
            for k in range(int(rng.integers(3, 7))):
                y = 10 + k * 7
                d.line([(8, y + rng.uniform(-3, 3)), (48, y + rng.uniform(-3, 3))], fill=255, width=max(2, w - 1))
        out.append(_fit28(np.asarray(im)))
    return np.stack(out)


def _gauss_blur(x: torch.Tensor, sigma: torch.Tensor) -> torch.Tensor:
    """Per-sample Gaussian blur ([B,1,H,W], sigma [B] in pixels; 0 leaves the sample as it is)."""
    b = x.shape[0]
    r = 3
    t = torch.arange(-r, r + 1, dtype=x.dtype)
    s = sigma.clamp(min=1e-3)[:, None]
    k = torch.exp(-(t[None, :] ** 2) / (2 * s**2))
    k = k / k.sum(1, keepdim=True)
    xx = x.reshape(1, b, *x.shape[2:])
    xx = F.conv2d(F.pad(xx, (r, r, 0, 0), mode="replicate"), k[:, None, None, :], groups=b)
    xx = F.conv2d(F.pad(xx, (0, 0, r, r), mode="replicate"), k[:, None, :, None], groups=b)
    return xx.reshape_as(x)


def _dct_matrix(n: int = 8) -> torch.Tensor:
    m = torch.zeros(n, n)
    for k in range(n):
        for i in range(n):
            m[k, i] = math.cos(math.pi * (2 * i + 1) * k / (2 * n)) * (math.sqrt(1 / n) if k == 0 else math.sqrt(2 / n))
    return m


_DCT = _dct_matrix()
# The JPEG standard's example luminance quantisation table (ITU-T T.81 Annex K, table K.1).
_QLUM = torch.tensor(
    [
        [16, 11, 10, 16, 24, 40, 51, 61], [12, 12, 14, 19, 26, 58, 60, 55], [14, 13, 16, 24, 40, 57, 69, 56],
        [14, 17, 22, 29, 51, 87, 80, 62], [18, 22, 37, 56, 68, 109, 103, 77], [24, 35, 55, 64, 81, 104, 113, 92],
        [49, 64, 78, 87, 103, 121, 120, 101], [72, 92, 95, 98, 112, 100, 103, 99],
    ],
    dtype=torch.float32,
)


def _jpeg_like(g: torch.Tensor, quality: torch.Tensor) -> torch.Tensor:
    """8 x 8 block DCT quantisation with the T.81 table scaled as libjpeg scales it for a quality 1..100."""
    b, _, h, w = g.shape
    q = quality.clamp(5, 100)
    scale = torch.where(q < 50, 5000 / q, 200 - 2 * q) / 100
    table = (_QLUM[None] * scale[:, None, None]).clamp(min=1)  # [B, 8, 8]
    blocks = (g - 128).reshape(b, h // 8, 8, w // 8, 8).permute(0, 1, 3, 2, 4)
    coef = _DCT @ blocks @ _DCT.T
    coef = torch.round(coef / table[:, None, None]) * table[:, None, None]
    back = _DCT.T @ coef @ _DCT
    return (back.permute(0, 1, 3, 2, 4).reshape(b, 1, h, w) + 128).clamp(0, 255)


def _place(glyphs: torch.Tensor, centre: torch.Tensor, height: torch.Tensor, shear: torch.Tensor, rot: torch.Tensor, xscale: torch.Tensor) -> torch.Tensor:
    """Warp 28 x 28 glyphs onto the canvas: content height `height` canvas px, centre (x, y) canvas px."""
    b = glyphs.shape[0]
    k = height / 20.0 * 14.0 / (CANVAS / 2)  # canvas-normalised units per glyph-normalised unit
    cos, sin = torch.cos(rot), torch.sin(rot)
    m = torch.zeros(b, 2, 2)
    # forward: canvas = k * R * Shear * Sx * glyph
    m[:, 0, 0] = xscale * cos
    m[:, 0, 1] = shear * cos - sin
    m[:, 1, 0] = xscale * sin
    m[:, 1, 1] = shear * sin + cos
    m = m * k[:, None, None]
    inv = torch.linalg.inv(m)
    c0 = (centre - CANVAS / 2) / (CANVAS / 2)
    theta = torch.cat([inv, -(inv @ c0[:, :, None])], dim=2)
    grid = F.affine_grid(theta, [b, 1, CANVAS, CANVAS], align_corners=False)
    return F.grid_sample(glyphs, grid, mode="bilinear", padding_mode="zeros", align_corners=False)


def normalise(gray: torch.Tensor, inside: torch.Tensor) -> torch.Tensor:
    """Per-cell normalisation over the cell's own pixels (src/read/digit-cell.ts does the same)."""
    b = gray.shape[0]
    flat = gray.reshape(b, -1).clone()
    flat[~inside.reshape(b, -1)] = float("nan")
    paper = torch.nanquantile(flat, PAPER_PERCENTILE, dim=1)
    dark = torch.nanquantile(flat, DARK_PERCENTILE, dim=1)
    scale = (paper - dark).clamp(min=MIN_CONTRAST)
    ink = ((paper[:, None, None, None] - gray) / scale[:, None, None, None]).clamp(0, 1)
    return ink * inside


def render_cells(glyphs: torch.Tensor, kinds: torch.Tensor, gen: torch.Generator, neighbours: torch.Tensor, strength: float = 1.0) -> torch.Tensor:
    """Batch of cells [B, 1, INPUT, INPUT] ink 0..1. glyphs [B, 1, 28, 28] float 0..1; kinds: 0 glyph, 1 empty.
    `neighbours` [B, 1, 28, 28]: other glyphs whose edge may spill into the cell. strength scales the augmentation."""
    b = glyphs.shape[0]

    def u(lo: float, hi: float, n: int = b) -> torch.Tensor:
        return lo + (hi - lo) * torch.rand(n, generator=gen)

    def chance(p: float) -> torch.Tensor:
        return torch.rand(b, generator=gen) < p * strength if p < 1 else torch.ones(b, dtype=torch.bool)

    # Cell shape: tall/square cells (w/h 0.55..1) mostly, some wide ones (h/w 0.6..1); fitted into the canvas.
    tall = torch.rand(b, generator=gen) < 0.75
    frac = u(0.55, 1.0)
    cw = torch.where(tall, frac * CANVAS, torch.full((b,), float(CANVAS)))
    ch = torch.where(tall, torch.full((b,), float(CANVAS)), u(0.6, 1.0) * CANVAS)
    x0, y0 = (CANVAS - cw) / 2, (CANVAS - ch) / 2
    yy = torch.arange(CANVAS, dtype=torch.float32)[None, :, None] + 0.5
    xx = torch.arange(CANVAS, dtype=torch.float32)[None, None, :] + 0.5
    inside = ((xx >= x0[:, None, None]) & (xx < (x0 + cw)[:, None, None]) & (yy >= y0[:, None, None]) & (yy < (y0 + ch)[:, None, None]))[:, None]

    # The writing: size relative to the cell, offset, slant, rotation, width.
    height = torch.minimum(ch * u(0.42, 0.9), cw * 1.25 * u(0.75, 1.0))
    s = strength
    centre = torch.stack([CANVAS / 2 + cw * u(-0.14, 0.14) * s, CANVAS / 2 + ch * u(-0.14, 0.14) * s], 1)
    ink = _place(glyphs, centre, height, u(-0.35, 0.35) * s, u(-0.17, 0.17) * s, u(0.75, 1.2))
    # Stroke width: thicker (max filter) or thinner (min filter) pens.
    thick = chance(0.35)
    ink = torch.where(thick[:, None, None, None], F.max_pool2d(ink, 3, 1, 1), ink)
    thick2 = chance(0.12)
    ink = torch.where(thick2[:, None, None, None], F.max_pool2d(ink, 3, 1, 1), ink)
    thin = chance(0.2) & ~thick
    ink = torch.where(thin[:, None, None, None], -F.max_pool2d(-ink, 3, 1, 1), ink)
    ink = ink * (kinds == 0).float()[:, None, None, None]

    # A neighbour's stroke crossing the cell edge.
    spill = chance(0.12)
    side = torch.where(torch.rand(b, generator=gen) < 0.5, -1.0, 1.0)
    ncentre = torch.stack([CANVAS / 2 + side * cw * u(0.85, 1.05), CANVAS / 2 + ch * u(-0.1, 0.1)], 1)
    nb = _place(neighbours, ncentre, height, u(-0.3, 0.3), torch.zeros(b), torch.ones(b))
    ink = torch.maximum(ink, nb * spill.float()[:, None, None, None])

    # Small specks and dust (also in empty cells).
    specks = (torch.rand(b, 1, CANVAS, CANVAS, generator=gen) < 0.0015) & chance(0.3)[:, None, None, None]
    ink = torch.maximum(ink, F.max_pool2d(specks.float(), 3, 1, 1) * u(0.3, 1.0)[:, None, None, None])

    # Printed cell borders and their remnants after the cell cut: each side present or not, offset inward or
    # outward, thickness, strength, some only partway (ticks of a comb that rise from the baseline).
    border = torch.zeros(b, 1, CANVAS, CANVAS)
    for side_i in range(4):
        present = chance(0.75)
        off = u(-2.0, 6.0)
        thick_px = u(1.0, 5.0)
        level = u(0.45, 1.0)
        partial = chance(0.2)
        reach = torch.where(partial, u(0.25, 0.6), torch.ones(b))
        if side_i == 0:  # left
            pos, coord, span_lo, span = x0 + off, xx, y0, ch
            along = yy
        elif side_i == 1:  # right
            pos, coord, span_lo, span = x0 + cw - off - thick_px, xx, y0, ch
            along = yy
        elif side_i == 2:  # top
            pos, coord, span_lo, span = y0 + off, yy, x0, cw
            along = xx
        else:  # bottom
            pos, coord, span_lo, span = y0 + ch - off - thick_px, yy, x0, cw
            along = xx
        across = (coord >= pos[:, None, None]) & (coord < (pos + thick_px)[:, None, None])
        if side_i < 2:  # vertical separators may rise only partway from the bottom
            lo = span_lo + span * (1 - reach)
            alongm = along >= lo[:, None, None]
        else:
            alongm = torch.ones(1, 1, CANVAS, dtype=torch.bool)
        line = (across & alongm).float()[:, None] * (present.float() * level)[:, None, None, None]
        border = torch.maximum(border, line)

    # Gray levels: paper, the pen's ink, the printed rules' ink, then scan noise, blur and JPEG.
    paper = u(175, 255)
    pen = paper - u(0.35, 1.0) * paper
    rule = paper - u(0.3, 1.0) * paper
    gray = paper[:, None, None, None] - torch.maximum(ink * (paper - pen)[:, None, None, None], border * (paper - rule)[:, None, None, None])
    gray = gray + torch.randn(b, 1, CANVAS, CANVAS, generator=gen) * (u(0, 10) * s)[:, None, None, None]
    gray = gray + (torch.randn(b, 1, CANVAS // 8, CANVAS // 8, generator=gen).repeat_interleave(8, 2).repeat_interleave(8, 3) * u(0, 4)[:, None, None, None])
    gray = _gauss_blur(gray, torch.where(chance(0.6), u(0.3, 1.4) * s, torch.zeros(b)))
    jpeg = chance(0.45)
    gray = torch.where(jpeg[:, None, None, None], _jpeg_like(gray.clamp(0, 255), u(30, 90)), gray)
    gray = gray.clamp(0, 255).round()
    cell = normalise(gray, inside)
    return F.avg_pool2d(cell, 2)
