"""Export a QuireNet checkpoint to the ONNX file the runtime loads.

  /usr/bin/python3 training/export.py --checkpoint training/runs/main/final.pt --out models/form-elements.onnx

Graph: input "image" [1, 1, H, W] float 0..1 (white paper = 1), output "detections" [1, 4 + C, N]:
cx, cy, w, h in input pixels, then C sigmoid class scores (decoding happens inside the graph).
metadata_props: class_names (JSON array), input_size ("WxH"), and how to letterbox and threshold.
"""

from __future__ import annotations

import cpu_sharing  # noqa: F401  (must precede torch)
import argparse
import json
import os
import sys
import warnings

import onnx
import torch

from evaluate import load_checkpoint
from onnx_save import save_with_metadata
from model import CLASS_NAMES, INPUT_H, INPUT_W, STRIDE, ExportWrapper
from pages import DataError, fail

OPSET = 13
# Score threshold the model card's recall/precision figures are measured at.
DEFAULT_OPERATING_THRESHOLD = 0.3


def export(checkpoint: str, out: str, operating_threshold: float, extra: dict[str, str]) -> None:
    net = load_checkpoint(checkpoint).to(memory_format=torch.contiguous_format)
    wrapper = ExportWrapper(net).eval()
    dummy = torch.full((1, 1, INPUT_H, INPUT_W), 1.0)
    tmp = f"{out}.{os.getpid()}.tmp"
    # torch 1.13 warns about its own constant nodes (upsampling scales) during shape inference; the exported
    # shapes are static and checked below, so the warning carries no information here.
    warnings.filterwarnings("ignore", message="The shape inference of prim::Constant")
    torch.onnx.export(
        wrapper,
        dummy,
        tmp,
        opset_version=OPSET,
        input_names=["image"],
        output_names=["detections"],
        do_constant_folding=True,
    )
    model = onnx.load(tmp)
    meta = {
        "class_names": json.dumps(CLASS_NAMES),
        "input_size": f"{INPUT_W}x{INPUT_H}",
        "stride": str(STRIDE),
        "output_layout": "xywh-scores",
        # Matches src/detect/letterbox.ts: fit keeping aspect ratio, page at the top-left, white (1.0) padding.
        "letterbox_align": "top-left",
        "operating_threshold": str(operating_threshold),
        "architecture": "QuireNet (formglean): single-stage anchor-free, one stride-4 grid",
        **extra,
    }
    save_with_metadata(model, meta, "formglean training/export.py", tmp, out)


def main(argv: list[str]) -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--checkpoint", required=True, help="final.pt (or last.pt) from train.py")
    parser.add_argument("--out", required=True, help="ONNX file to write")
    parser.add_argument("--threshold", type=float, default=DEFAULT_OPERATING_THRESHOLD, help="operating score threshold")
    parser.add_argument("--meta", action="append", default=[], metavar="KEY=VALUE", help="extra metadata_props entry")
    args = parser.parse_args(argv)
    extra = {}
    for item in args.meta:
        key, sep, value = item.partition("=")
        if not sep or not key:
            fail(DataError(f"--meta {item}: expected KEY=VALUE"))
        extra[key] = value
    try:
        export(args.checkpoint, args.out, args.threshold, extra)
    except DataError as err:
        fail(err)
    size = os.path.getsize(args.out)
    print(f"wrote {args.out} ({size / 1e6:.2f} MB, opset {OPSET}, input {INPUT_W}x{INPUT_H})")


if __name__ == "__main__":
    main(sys.argv[1:])
