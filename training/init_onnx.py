"""Start training from a shipped ONNX detector (fine-tuning) instead of a checkpoint.

The exported graph has every BatchNorm folded into the convolution before it (torch.onnx.export with constant
folding), so the weights come back as: convolution weight = the folded weight, and the BatchNorm after it an
identity with the folded bias as its shift (scale 1, running mean 0, running variance 1 - eps, so that
x / sqrt(var + eps) = x). Convolutions without a BatchNorm keep their names in the graph ("net.lat32.weight");
the folded ones are unnamed ("onnx::Conv_375") and are taken in graph order, which is the network's forward order.

Batch statistics of the original training are gone with the folding, so a fine-tuned network keeps its BatchNorm
layers in inference mode (`freeze_batchnorm`): their running statistics stay fixed and only scale and shift learn.
"""

from __future__ import annotations

import numpy as np
import onnx
import torch
import torch.nn as nn
from onnx import numpy_helper

from model import QuireNet
from pages import DataError


def conv_bn_pairs(net: QuireNet) -> list[tuple[nn.Conv2d, nn.BatchNorm2d]]:
    """Each convolution followed by a BatchNorm, in registration order (the forward order of QuireNet)."""
    pairs: list[tuple[nn.Conv2d, nn.BatchNorm2d]] = []
    pending: nn.Conv2d | None = None
    for m in net.modules():
        if isinstance(m, nn.Conv2d):
            pending = m if m.bias is None else None
        elif isinstance(m, nn.BatchNorm2d):
            if pending is None:
                raise DataError("network layout: a BatchNorm without a convolution before it")
            pairs.append((pending, m))
            pending = None
    return pairs


def load_onnx_weights(net: QuireNet, path: str) -> None:
    """Copy the weights of an exported QuireNet ONNX file into `net` (same width and classes)."""
    try:
        model = onnx.load(path)
    except Exception as err:  # onnx raises several types for unreadable files
        raise DataError(f"{path}: not a readable ONNX file ({err})") from None
    inits = {i.name: numpy_helper.to_array(i) for i in model.graph.initializer}
    state = net.state_dict()
    named = {k[len("net."):]: v for k, v in inits.items() if k.startswith("net.")}
    folded: list[tuple[np.ndarray, np.ndarray]] = []
    for node in model.graph.node:
        if node.op_type != "Conv":
            continue
        weight = node.input[1]
        if weight.startswith("net."):
            continue
        bias = node.input[2] if len(node.input) > 2 else None
        if weight not in inits or bias not in inits:
            raise DataError(f"{path}: convolution {node.name} has weights that are not stored constants")
        folded.append((inits[weight], inits[bias]))
    pairs = conv_bn_pairs(net)
    if len(folded) != len(pairs):
        raise DataError(f"{path}: {len(folded)} folded convolutions, the network has {len(pairs)}: another architecture or width")
    with torch.no_grad():
        for key, value in named.items():
            if key not in state or tuple(state[key].shape) != value.shape:
                raise DataError(f"{path}: {key} does not fit the network (another architecture, width or class count)")
            state[key].copy_(torch.from_numpy(value.copy()))
        for (conv, bn), (w, b) in zip(pairs, folded):
            if tuple(conv.weight.shape) != w.shape:
                raise DataError(f"{path}: a folded convolution of shape {w.shape} does not fit {tuple(conv.weight.shape)}")
            conv.weight.copy_(torch.from_numpy(w.copy()))
            bn.weight.fill_(1.0)
            bn.bias.copy_(torch.from_numpy(b.copy()))
            bn.running_mean.zero_()
            bn.running_var.fill_(1.0 - bn.eps)


def freeze_batchnorm(net: nn.Module) -> None:
    """BatchNorm layers to inference mode (fixed running statistics) while the rest trains."""
    for m in net.modules():
        if isinstance(m, nn.BatchNorm2d):
            m.eval()
