"""Write an exported ONNX model with its metadata: checked, then saved through a temp file and a rename."""
from __future__ import annotations

import os

import onnx


def save_with_metadata(model: onnx.ModelProto, meta: dict[str, str], producer: str, tmp: str, out: str) -> None:
    """Replace the model's metadata with `meta`, name the producer, check it, write it to `tmp` and rename that to `out`."""
    del model.metadata_props[:]
    for key, value in meta.items():
        entry = model.metadata_props.add()
        entry.key, entry.value = key, value
    model.producer_name = producer
    onnx.checker.check_model(model)
    onnx.save(model, tmp)
    os.replace(tmp, out)
