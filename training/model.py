"""QuireNet: a compact single-stage, anchor-free detector for form pages.

Design (our own): a light depthwise-separable backbone goes down to stride 32 so that the
centre of a long underline field can "see" both of its ends; a top-down path brings that
context back to one stride-4 output grid, fine enough for 10-pixel checkboxes. Every grid
cell predicts C class scores and four distances (left, top, right, bottom) from the cell
centre to the box edges. There are no anchors and only one output scale.

The module returns raw maps for training; `decode` turns them into the shipped layout
[B, 4 + C, N]: cx, cy, w, h in input pixels, then sigmoid class scores.
"""

from __future__ import annotations

import torch
import torch.nn as nn
import torch.nn.functional as F

CLASS_NAMES = ["text_entry", "checkbox", "signature_area", "comb_field"]
STRIDE = 4
# Input size (width, height): portrait pages, 640 px on the long side; both divisible by 32.
INPUT_W = 512
INPUT_H = 640
# Distances are predicted as STRIDE * exp(raw); clamping raw keeps exp finite in float32
# (exp(7) * 4 ~ 4400 px, far beyond the 640 px input).
MAX_LOG_DISTANCE = 7.0


def conv_bn_relu(cin: int, cout: int, k: int = 3, stride: int = 1) -> nn.Sequential:
    return nn.Sequential(
        nn.Conv2d(cin, cout, k, stride, k // 2, bias=False),
        nn.BatchNorm2d(cout),
        nn.ReLU(inplace=True),
    )


class SeparableBlock(nn.Module):
    """Depthwise 3x3 (optionally strided or dilated) then pointwise 1x1, residual when shapes match."""

    def __init__(self, cin: int, cout: int, stride: int = 1, dilation: int = 1):
        super().__init__()
        self.depthwise = nn.Conv2d(cin, cin, 3, stride, dilation, dilation=dilation, groups=cin, bias=False)
        self.bn1 = nn.BatchNorm2d(cin)
        self.pointwise = nn.Conv2d(cin, cout, 1, bias=False)
        self.bn2 = nn.BatchNorm2d(cout)
        self.residual = stride == 1 and cin == cout

    def forward(self, x: torch.Tensor) -> torch.Tensor:
        y = F.relu(self.bn1(self.depthwise(x)))
        y = self.bn2(self.pointwise(y))
        if self.residual:
            y = y + x
        return F.relu(y)


class QuireNet(nn.Module):
    def __init__(self, num_classes: int = len(CLASS_NAMES), width: int = 24):
        super().__init__()
        w = width
        self.num_classes = num_classes
        # A thin stride-2 stem: full-resolution layers dominate the cost on a CPU, and strokes of
        # 1..2 px survive one 3x3 stride-2 filter bank of a few channels.
        self.stem = conv_bn_relu(1, 8, 3, 2)  # /2
        self.stage4 = nn.Sequential(SeparableBlock(8, w, 2), SeparableBlock(w, w))  # /4
        self.stage8 = nn.Sequential(SeparableBlock(w, 2 * w, 2), SeparableBlock(2 * w, 2 * w))  # /8
        self.stage16 = nn.Sequential(
            SeparableBlock(2 * w, 3 * w, 2), SeparableBlock(3 * w, 3 * w), SeparableBlock(3 * w, 3 * w, dilation=2)
        )  # /16
        self.stage32 = nn.Sequential(
            SeparableBlock(3 * w, 4 * w, 2), SeparableBlock(4 * w, 4 * w, dilation=2), SeparableBlock(4 * w, 4 * w, dilation=2)
        )  # /32
        # Top-down path: lateral 1x1 projections, nearest upsampling, a separable block to mix.
        self.lat32 = nn.Conv2d(4 * w, 2 * w, 1)
        self.lat16 = nn.Conv2d(3 * w, 2 * w, 1)
        self.mix16 = SeparableBlock(2 * w, 2 * w)
        self.lat8 = nn.Conv2d(2 * w, 2 * w, 1)
        self.mix8 = SeparableBlock(2 * w, 2 * w)
        self.down8to4 = nn.Conv2d(2 * w, w, 1)
        self.lat4 = nn.Conv2d(w, w, 1)
        self.mix4 = SeparableBlock(w, w)
        # One shared stride-4 block feeds both 1x1 outputs (two branches cost a third more per page).
        self.head = SeparableBlock(w, w)
        self.cls_out = nn.Conv2d(w, num_classes, 1)
        self.box_out = nn.Conv2d(w, 4, 1)
        # Start class scores near a 1 % prior so the first steps are not swamped by easy negatives
        # (common practice for sigmoid heads trained with focal-type losses).
        nn.init.constant_(self.cls_out.bias, -4.6)
        nn.init.normal_(self.cls_out.weight, std=0.01)
        nn.init.normal_(self.box_out.weight, std=0.01)
        nn.init.constant_(self.box_out.bias, 1.0)

    def forward(self, x: torch.Tensor) -> tuple[torch.Tensor, torch.Tensor]:
        """x: [B, 1, H, W] in 0..1 (white paper = 1). Returns class logits [B, C, H/4, W/4]
        and raw log-distances [B, 4, H/4, W/4]."""
        # Centre the input so that paper (1.0) and ink (0.0) are symmetric around zero.
        x = (x - 0.5) * 2.0
        c2 = self.stem(x)
        c4 = self.stage4(c2)
        c8 = self.stage8(c4)
        c16 = self.stage16(c8)
        c32 = self.stage32(c16)
        p16 = self.mix16(self.lat16(c16) + F.interpolate(self.lat32(c32), scale_factor=2.0, mode="nearest"))
        p8 = self.mix8(self.lat8(c8) + F.interpolate(p16, scale_factor=2.0, mode="nearest"))
        p4 = self.mix4(self.lat4(c4) + F.interpolate(self.down8to4(p8), scale_factor=2.0, mode="nearest"))
        shared = self.head(p4)
        logits = self.cls_out(shared)
        log_dist = self.box_out(shared)
        return logits, log_dist


def cell_centres(height: int, width: int, device=None) -> tuple[torch.Tensor, torch.Tensor]:
    """Centres (x, y) in input pixels of the stride-4 grid cells, each [H/4 * W/4] in row-major order."""
    gh, gw = height // STRIDE, width // STRIDE
    ys = (torch.arange(gh, dtype=torch.float32, device=device) + 0.5) * STRIDE
    xs = (torch.arange(gw, dtype=torch.float32, device=device) + 0.5) * STRIDE
    gy, gx = torch.meshgrid(ys, xs, indexing="ij")
    return gx.reshape(-1), gy.reshape(-1)


def distances(log_dist: torch.Tensor) -> torch.Tensor:
    """Raw head output -> non-negative distances (l, t, r, b) in input pixels."""
    return torch.exp(torch.clamp(log_dist, max=MAX_LOG_DISTANCE)) * STRIDE


def decode(logits: torch.Tensor, log_dist: torch.Tensor, centres: tuple[torch.Tensor, torch.Tensor] | None = None) -> torch.Tensor:
    """Raw maps -> [B, 4 + C, N]: cx, cy, w, h (input pixels), then sigmoid class scores."""
    b, c, gh, gw = logits.shape
    gx, gy = centres if centres is not None else cell_centres(gh * STRIDE, gw * STRIDE, logits.device)
    d = distances(log_dist).reshape(b, 4, gh * gw)
    left, top, right, bottom = d[:, 0], d[:, 1], d[:, 2], d[:, 3]
    cx = gx + (right - left) * 0.5
    cy = gy + (bottom - top) * 0.5
    w = left + right
    h = top + bottom
    boxes = torch.stack([cx, cy, w, h], dim=1)
    scores = torch.sigmoid(logits).reshape(b, c, gh * gw)
    return torch.cat([boxes, scores], dim=1)


class ExportWrapper(nn.Module):
    """The shipped graph: image in, decoded [1, 4 + C, N] out."""

    def __init__(self, net: QuireNet):
        super().__init__()
        self.net = net
        # Cell centres as stored constants: the exported graph then holds no index arithmetic.
        gx, gy = cell_centres(INPUT_H, INPUT_W)
        self.register_buffer("gx", gx)
        self.register_buffer("gy", gy)

    def forward(self, x: torch.Tensor) -> torch.Tensor:
        logits, log_dist = self.net(x)
        return decode(logits, log_dist, (self.gx, self.gy))
