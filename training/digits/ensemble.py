"""Average exported digit readers into one ONNX model: the mean of their class probabilities.

  /usr/bin/python3 training/digits/ensemble.py --models models/digit-cells.onnx training/runs/digits-b/digit-cells.onnx \
      --out training/runs/ensemble/digit-cells.onnx

Each input model is what export.py writes (input "cells" [N, 1, 32, 32], output "probabilities" [N, 12], same
classes and cell normalisation); their graphs are copied side by side under prefixes m0_, m1_, ... reading the one
input, and the outputs are summed and scaled by 1/k. Averaging the probabilities of networks trained from different
seeds and augmentations is the plain ensemble of common practice; it costs k times the multiply-adds per cell.
The metadata of the first model is kept, with `architecture` naming the members and `ensemble_members` their sha256.
"""

from __future__ import annotations

import argparse
import hashlib
import json
import os
import sys

import numpy as np
import onnx
from onnx import helper, numpy_helper

sys.path.append(os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
from onnx_save import save_with_metadata  # noqa: E402


def sha256(path: str) -> str:
    with open(path, "rb") as fh:
        return hashlib.sha256(fh.read()).hexdigest()


def half_weights(nodes: list, inits: list) -> tuple[list, list]:
    """Float32 weight tensors stored as float16, each cast back to float32 by a Cast node ahead of the graph: the
    file halves; the network still computes in float32 on weights rounded to float16 (about 3 significant digits,
    far finer than the training noise of these weights; the bench measures the effect)."""
    kept, casts = [], []
    for t in inits:
        if t.data_type != onnx.TensorProto.FLOAT or len(t.dims) == 0:
            kept.append(t)
            continue
        values = numpy_helper.to_array(t).astype(np.float16)
        kept.append(numpy_helper.from_array(values, f"{t.name}_f16"))
        casts.append(helper.make_node("Cast", [f"{t.name}_f16"], [t.name], to=onnx.TensorProto.FLOAT))
    return casts + nodes, kept


def main(argv: list[str]) -> None:
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--models", nargs="+", required=True)
    ap.add_argument("--out", required=True)
    ap.add_argument(
        "--half-weights",
        action="store_true",
        help="store the weights as float16, cast to float32 when the model loads (half the file; arithmetic stays float32)",
    )
    args = ap.parse_args(argv)
    members = [onnx.load(p) for p in args.models]
    metas = [{p.key: p.value for p in m.metadata_props} for m in members]
    for m in metas[1:]:
        for key in ("class_names", "input_size", "normalisation"):
            if m.get(key) != metas[0].get(key):
                raise SystemExit(f"members disagree on {key}: they must read the same cells")
    first = members[0].graph
    nodes, inits, value_infos = [], [], []
    outputs = []
    for k, m in enumerate(members):
        p = f"m{k}_"
        g = onnx.compose.add_prefix(m, prefix=p).graph
        nodes.append(helper.make_node("Identity", [first.input[0].name], [g.input[0].name]))
        for n in g.node:
            nodes.append(n)
        inits.extend(g.initializer)
        value_infos.extend(g.value_info)
        outputs.append(g.output[0].name)
    if args.half_weights:
        nodes, inits = half_weights(nodes, inits)
    nodes.append(helper.make_node("Sum", outputs, ["summed"]))
    inits.append(helper.make_tensor("ensemble_scale", onnx.TensorProto.FLOAT, [], [1.0 / len(members)]))
    nodes.append(helper.make_node("Mul", ["summed", "ensemble_scale"], ["probabilities"]))
    graph = helper.make_graph(nodes, "digit_cells_ensemble", [first.input[0]], [first.output[0]], inits, value_info=value_infos)
    model = helper.make_model(graph, opset_imports=members[0].opset_import)
    model.ir_version = members[0].ir_version
    meta = dict(metas[0])
    meta["architecture"] = f"mean of {len(members)} DigitCellCNN members' probabilities: " + "; ".join(
        mm.get("architecture", "?") for mm in metas
    )
    meta["ensemble_members"] = json.dumps([sha256(p)[:12] for p in args.models])
    if args.half_weights:
        meta["weights"] = "float16, cast to float32 on load"

    save_with_metadata(model, meta, "formglean training/digits/ensemble.py", f"{args.out}.{os.getpid()}.tmp", args.out)
    print(f"wrote {args.out} ({os.path.getsize(args.out)} bytes) from {len(members)} members")


if __name__ == "__main__":
    main(sys.argv[1:])
