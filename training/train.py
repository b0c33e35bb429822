"""Train the QuireNet form-element detector on generated pages (CPU, resumable, seeded).

  nice -n 5 /usr/bin/python3 training/train.py --data training/data/train-a training/data/train-b \
      --val training/data/val --epochs 12 --seed 7 --out training/runs/main

Writes <out>/last.pt (resumable checkpoint, rewritten every --checkpoint-every steps and at the end
of each epoch), <out>/final.pt (EMA weights, for export) and <out>/train-info.json (command, seed,
data, steps, wall time). Re-running the same command resumes from <out>/last.pt.
Every sample's augmentation is drawn from (seed, epoch, page) alone, so a resumed run sees the
same batches as an uninterrupted one.
"""

from __future__ import annotations

import cpu_sharing  # noqa: F401  (must precede torch)
import argparse
import copy
import json
import math
import os
import random
import shlex
import sys
import time

import numpy as np
import torch

from augment import compose
from evaluate import collect, format_report, score
from init_onnx import freeze_batchnorm, load_onnx_weights
from loss import detection_loss
from model import CLASS_NAMES, INPUT_H, INPUT_W, QuireNet
from pages import DataError, fail, load_page_set
from targets import assign

# Linear warm-up over the first tenth of the run, at most 300 steps (common practice for AdamW on a fresh net).
WARMUP_FRACTION = 0.1
WARMUP_MAX = 300
FINAL_LR_FRACTION = 0.05
EMA_DECAY = 0.999  # weight averaging for the exported model (common practice: 0.999..0.9999)


class PageSamples(torch.utils.data.Dataset):
    """Items are keys (epoch, global page index); the key alone fixes the augmentation."""

    def __init__(self, page_sets, seed: int):
        self.sets = page_sets
        self.seed = seed
        self.index = [(s, i) for s, ps in enumerate(page_sets) for i in range(len(ps.images))]

    def __len__(self) -> int:
        return len(self.index)

    def __getitem__(self, key):
        epoch, k = key
        s, i = self.index[k]
        ps = self.sets[s]
        rng = np.random.default_rng([self.seed, epoch, k])
        image, boxes, classes = compose(ps.images[i], ps.boxes[i], ps.classes[i], rng)
        cls_t, box_t, cells = assign(boxes, classes)
        return torch.from_numpy(image)[None], torch.from_numpy(cls_t), torch.from_numpy(box_t), torch.from_numpy(cells)


def class_balanced_weights(page_sets, uniform_share: float = 0.5) -> np.ndarray:
    """Page drawing probabilities in which every class carries the same total: a page's balanced weight is the sum,
    over classes, of its share of that class's boxes, so a page holding the only signature areas is drawn as often as
    all pages of text entries together. Mixed with `uniform_share` of uniform drawing so that every page, boxless
    ones (pure negatives) included, is still seen (common practice for repeat-factor sampling of rare classes)."""
    counts = [np.bincount(c, minlength=len(CLASS_NAMES)) if len(c) else np.zeros(len(CLASS_NAMES), dtype=np.int64) for ps in page_sets for c in ps.classes]
    per_page = np.stack(counts).astype(np.float64)
    totals = per_page.sum(axis=0)
    present = totals > 0
    balanced = (per_page[:, present] / totals[present]).sum(axis=1)
    balanced /= max(balanced.sum(), 1e-12)
    uniform = np.full(len(counts), 1.0 / len(counts))
    return uniform_share * uniform + (1 - uniform_share) * balanced


class StepBatches(torch.utils.data.Sampler):
    """Batches of keys for global steps [start, total): epoch e uses a (seed, e)-seeded permutation, or, with
    `weights`, a (seed, e)-seeded draw with replacement by those page probabilities."""

    def __init__(self, n: int, batch: int, seed: int, start: int, total: int, weights: np.ndarray | None = None):
        self.n, self.batch, self.seed, self.start, self.total = n, batch, seed, start, total
        self.weights = weights
        self.per_epoch = max(1, n // batch)

    def __len__(self) -> int:
        return max(0, self.total - self.start)

    def __iter__(self):
        perm_epoch, perm = -1, None
        for step in range(self.start, self.total):
            epoch, b = divmod(step, self.per_epoch)
            if epoch != perm_epoch:
                rng = np.random.default_rng([self.seed, epoch, 7919])
                perm_epoch = epoch
                perm = rng.permutation(self.n) if self.weights is None else rng.choice(self.n, size=self.n, p=self.weights)
            if self.n < self.batch:
                picks = np.resize(perm, self.batch)
            else:
                picks = perm[b * self.batch : (b + 1) * self.batch]
            yield [(epoch, int(k)) for k in picks]


def learning_rate(step: int, total: int, peak: float, time_fraction: float = 0.0) -> float:
    """Linear warm-up, then cosine decay to FINAL_LR_FRACTION of the peak. Under a wall budget the decay follows
    whichever is further along, the steps or the budget's time (`time_fraction`), so a run cut short by a busy
    machine still ends at the low learning rate instead of mid-schedule."""
    warmup = max(1, min(WARMUP_MAX, int(total * WARMUP_FRACTION)))
    if step < warmup:
        return peak * (step + 1) / warmup
    progress = max((step - warmup) / max(1, total - warmup), time_fraction)
    return peak * (FINAL_LR_FRACTION + (1 - FINAL_LR_FRACTION) * 0.5 * (1 + math.cos(math.pi * min(1.0, progress))))


def parameter_groups(net: torch.nn.Module, weight_decay: float):
    decay, plain = [], []
    for name, p in net.named_parameters():
        (decay if p.ndim == 4 else plain).append(p)  # no decay on BN scales and biases (common practice)
    return [{"params": decay, "weight_decay": weight_decay}, {"params": plain, "weight_decay": 0.0}]


def save_atomic(obj, path: str) -> None:
    tmp = f"{path}.{os.getpid()}.tmp"
    torch.save(obj, tmp)
    os.replace(tmp, path)


def write_json_atomic(obj, path: str) -> None:
    tmp = f"{path}.{os.getpid()}.tmp"
    with open(tmp, "w", encoding="utf-8") as fh:
        json.dump(obj, fh, indent=2)
        fh.write("\n")
    os.replace(tmp, path)


def main(argv: list[str]) -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--data", nargs="+", required=True, help="COCO directories from `formglean samples generate`")
    parser.add_argument("--val", nargs="*", default=[], help="COCO directories scored after each epoch")
    parser.add_argument("--epochs", type=int, default=12)
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--out", required=True, help="run directory (checkpoints, log, info)")
    parser.add_argument("--max-steps", type=int, default=0, help="stop after this many steps (smoke runs); 0 = all")
    parser.add_argument("--batch", type=int, default=8)
    parser.add_argument("--lr", type=float, default=3e-3)
    parser.add_argument("--weight-decay", type=float, default=5e-4)
    parser.add_argument("--width", type=int, default=24, help="base channel width of the network")
    parser.add_argument("--box-balance", action="store_true", help="weigh positive cells by 1/sqrt(cells of their box) (loss.py)")
    parser.add_argument("--class-balance", action="store_true", help="draw pages so every class carries the same weight (class_balanced_weights)")
    parser.add_argument("--init-onnx", help="fine-tune: start from the weights of an exported detector (init_onnx.py); BatchNorm stays frozen")
    parser.add_argument("--max-minutes", type=float, default=0, help="wall budget: the learning rate decays by steps or by time, whichever is further along, and the run stops (writing final.pt) when the budget is spent; 0 = none. Runs stopped by time are not bit-reproducible.")
    parser.add_argument("--threads", type=int, default=2)
    parser.add_argument("--workers", type=int, default=1, help="data-loading processes (0 = in the main process)")
    parser.add_argument("--checkpoint-every", type=int, default=200)
    parser.add_argument("--log-every", type=int, default=25)
    args = parser.parse_args(argv)

    torch.manual_seed(args.seed)
    np.random.seed(args.seed)
    random.seed(args.seed)
    torch.set_num_threads(args.threads)
    os.makedirs(args.out, exist_ok=True)
    log_path = os.path.join(args.out, "train.log")

    def log(msg: str) -> None:
        line = f"[{time.strftime('%H:%M:%S')}] {msg}"
        print(line, flush=True)
        with open(log_path, "a", encoding="utf-8") as fh:
            fh.write(line + "\n")

    try:
        train_sets = [load_page_set(d, log) for d in args.data]
        val_sets = [load_page_set(d, log) for d in args.val]
    except DataError as err:
        fail(err)
    dataset = PageSamples(train_sets, args.seed)
    if len(dataset) == 0:
        fail(DataError(f"{args.data[0]}: no pages"))
    steps_per_epoch = max(1, len(dataset) // args.batch)
    total_steps = steps_per_epoch * args.epochs

    net = QuireNet(width=args.width)
    if args.init_onnx:
        try:
            load_onnx_weights(net, args.init_onnx)
        except DataError as err:
            fail(err)
        log(f"initial weights from {args.init_onnx} (BatchNorm frozen)")
    net = net.to(memory_format=torch.channels_last)
    ema = copy.deepcopy(net).eval()
    for p in ema.parameters():
        p.requires_grad_(False)
    optimizer = torch.optim.AdamW(parameter_groups(net, args.weight_decay), lr=args.lr)
    step, elapsed_before = 0, 0.0
    last_path = os.path.join(args.out, "last.pt")
    if os.path.exists(last_path):
        state = torch.load(last_path, map_location="cpu")
        net.load_state_dict(state["model"])
        ema.load_state_dict(state["ema"])
        optimizer.load_state_dict(state["optimizer"])
        step, elapsed_before = int(state["step"]), float(state["elapsed"])
        torch.set_rng_state(state["torch_rng"])
        log(f"resumed from {last_path} at step {step}")
    stop_at = min(total_steps, args.max_steps) if args.max_steps > 0 else total_steps
    log(
        f"{len(dataset)} pages, {steps_per_epoch} steps/epoch, {args.epochs} epochs = {total_steps} steps"
        f" (running to {stop_at}); input {INPUT_W}x{INPUT_H}; seed {args.seed}"
    )

    def checkpoint(at_step: int, elapsed: float) -> None:
        save_atomic(
            {
                "model": net.state_dict(),
                "ema": ema.state_dict(),
                "optimizer": optimizer.state_dict(),
                "step": at_step,
                "elapsed": elapsed,
                "torch_rng": torch.get_rng_state(),
                "width": args.width,
            },
            last_path,
        )

    loader = torch.utils.data.DataLoader(
        dataset,
        batch_sampler=StepBatches(len(dataset), args.batch, args.seed, step, stop_at, class_balanced_weights(train_sets) if args.class_balance else None),
        num_workers=args.workers,
    )
    started = time.time()
    window_start, sums, window_steps = time.time(), np.zeros(3), 0
    def train_mode() -> None:
        net.train()
        if args.init_onnx:
            freeze_batchnorm(net)

    train_mode()
    for images, cls_t, box_t, cells_t in loader:
        budget_used = (elapsed_before + time.time() - started) / (60 * args.max_minutes) if args.max_minutes > 0 else 0.0
        lr = learning_rate(step, total_steps, args.lr, budget_used)
        for group in optimizer.param_groups:
            group["lr"] = lr
        images = images.contiguous(memory_format=torch.channels_last)
        logits, log_dist = net(images)
        total, cls_loss, box_loss = detection_loss(logits, log_dist, cls_t, box_t, cells_t if args.box_balance else None)
        optimizer.zero_grad(set_to_none=True)
        total.backward()
        torch.nn.utils.clip_grad_norm_(net.parameters(), 10.0)
        optimizer.step()
        with torch.no_grad():
            decay = min(EMA_DECAY, (1 + step) / (10 + step))
            for e, p in zip(ema.state_dict().values(), net.state_dict().values()):
                if e.dtype.is_floating_point:
                    e.mul_(decay).add_(p.detach(), alpha=1 - decay)
                else:
                    e.copy_(p)
        step += 1
        sums += [float(total), float(cls_loss), float(box_loss)]
        window_steps += 1
        elapsed = elapsed_before + time.time() - started
        if step % args.log_every == 0 or step == stop_at:
            n = window_steps
            per = (time.time() - window_start) / n
            log(
                f"step {step}/{stop_at} epoch {step / steps_per_epoch:.2f} loss {sums[0] / n:.4f}"
                f" (cls {sums[1] / n:.4f} box {sums[2] / n:.4f}) lr {lr:.2e} {per:.2f}s/step elapsed {elapsed / 60:.1f}min"
            )
            window_start, sums, window_steps = time.time(), np.zeros(3), 0
        if step % args.checkpoint_every == 0 or step % steps_per_epoch == 0 or step == stop_at:
            checkpoint(step, elapsed)
        if val_sets and (step % steps_per_epoch == 0 or step == stop_at):
            records = [r for vs in val_sets for r in collect(ema, vs)]
            log("validation (EMA weights)\n" + format_report(score(records, 0.3)))
            train_mode()
        if args.max_minutes > 0 and elapsed >= 60 * args.max_minutes:
            checkpoint(step, elapsed)
            log(f"wall budget of {args.max_minutes} min reached at step {step}")
            break

    elapsed = elapsed_before + time.time() - started
    save_atomic({"model": ema.state_dict(), "width": args.width, "step": step}, os.path.join(args.out, "final.pt"))
    write_json_atomic(
        {
            "command": " ".join(shlex.quote(a) for a in [sys.executable, *sys.argv]),
            "seed": args.seed,
            "box_balance": args.box_balance,
            "class_balance": args.class_balance,
            "init_onnx": args.init_onnx,
            "width": args.width,
            "data": {d: len(s.images) for d, s in zip(args.data, train_sets)},
            "val": {d: len(s.images) for d, s in zip(args.val, val_sets)},
            "epochs": args.epochs,
            "batch": args.batch,
            "steps": step,
            "total_steps": total_steps,
            "wall_minutes": round(elapsed / 60, 1),
            "classes": CLASS_NAMES,
            "torch": torch.__version__,
        },
        os.path.join(args.out, "train-info.json"),
    )
    log(f"done: {step} steps in {elapsed / 60:.1f} min; EMA weights in {os.path.join(args.out, 'final.pt')}")


if __name__ == "__main__":
    main(sys.argv[1:])
