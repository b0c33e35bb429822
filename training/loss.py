"""Training loss: quality-aware sigmoid classification plus generalized-IoU box regression.

Classification target of a positive cell is 0.5 + 0.5 * IoU(predicted box, its box): the score
then ranks detections by how well they are located (which is what AP rewards), while a positive
never asks for less than 0.5, so classes are learned from the first step even when boxes are
still poor. The loss is binary cross-entropy weighted by |score - target|^2, which lets the many
easy background cells fade out (the focal idea: Lin et al. 2017, "Focal Loss for Dense Object
Detection"; the soft IoU target follows Li et al. 2020, "Generalized Focal Loss").
Box loss: 1 - GIoU (Rezatofighi et al. 2019, "Generalized Intersection over Union").

Box balance (optional): a long field owns up to 8 x 8 cells and a checkbox 4..9, so per cell the loss is mostly
about long fields. With balance on, a positive cell weighs 1 / sqrt(cells its box owns), rescaled so that the
mean positive weight stays 1: small boxes count for more without changing the loss scale.
"""

from __future__ import annotations

import torch
import torch.nn.functional as F

from model import cell_centres, distances

BOX_WEIGHT = 2.0


def box_iou_giou(pred: torch.Tensor, target: torch.Tensor) -> tuple[torch.Tensor, torch.Tensor]:
    """Element-wise IoU and GIoU of [n, 4] x1 y1 x2 y2 boxes."""
    ix1 = torch.maximum(pred[:, 0], target[:, 0])
    iy1 = torch.maximum(pred[:, 1], target[:, 1])
    ix2 = torch.minimum(pred[:, 2], target[:, 2])
    iy2 = torch.minimum(pred[:, 3], target[:, 3])
    inter = (ix2 - ix1).clamp(min=0) * (iy2 - iy1).clamp(min=0)
    area_p = (pred[:, 2] - pred[:, 0]) * (pred[:, 3] - pred[:, 1])
    area_t = (target[:, 2] - target[:, 0]) * (target[:, 3] - target[:, 1])
    union = area_p + area_t - inter + 1e-6
    iou = inter / union
    ex1 = torch.minimum(pred[:, 0], target[:, 0])
    ey1 = torch.minimum(pred[:, 1], target[:, 1])
    ex2 = torch.maximum(pred[:, 2], target[:, 2])
    ey2 = torch.maximum(pred[:, 3], target[:, 3])
    enclose = (ex2 - ex1) * (ey2 - ey1) + 1e-6
    giou = iou - (enclose - union) / enclose
    return iou, giou


def detection_loss(
    logits: torch.Tensor,
    log_dist: torch.Tensor,
    cls_target: torch.Tensor,
    box_target: torch.Tensor,
    box_cells: torch.Tensor | None = None,
):
    """logits [B, C, gh, gw], log_dist [B, 4, gh, gw]; cls_target [B, N] (-1 background), box_target [B, N, 4];
    box_cells [B, N] (cells owned by each cell's box) turns box balance on. Returns (total, classification, box)."""
    b, c, gh, gw = logits.shape
    n = gh * gw
    logits = logits.permute(0, 2, 3, 1).reshape(b, n, c)
    d = distances(log_dist).permute(0, 2, 3, 1).reshape(b, n, 4)
    positive = cls_target >= 0
    num_pos = max(1.0, float(positive.sum()))

    score_target = torch.zeros_like(logits)
    cell_weight = torch.ones_like(logits[..., 0])
    box_loss = logits.new_zeros(())
    if positive.any():
        gx, gy = cell_centres(gh * 4, gw * 4, logits.device)
        gx = gx.expand(b, n)[positive]
        gy = gy.expand(b, n)[positive]
        dp = d[positive]
        pred = torch.stack([gx - dp[:, 0], gy - dp[:, 1], gx + dp[:, 2], gy + dp[:, 3]], dim=1)
        iou, giou = box_iou_giou(pred, box_target[positive])
        pos_weight = torch.ones_like(iou)
        if box_cells is not None:
            pos_weight = box_cells[positive].clamp(min=1).rsqrt()
            pos_weight = pos_weight / pos_weight.mean()
            cell_weight[positive] = pos_weight
        box_loss = ((1.0 - giou) * pos_weight).sum() / num_pos
        pos_idx = positive.nonzero(as_tuple=True)
        score_target[pos_idx[0], pos_idx[1], cls_target[positive]] = 0.5 + 0.5 * iou.detach().clamp(0, 1)

    prob = torch.sigmoid(logits)
    bce = F.binary_cross_entropy_with_logits(logits, score_target, reduction="none")
    cls_loss = (bce * (prob - score_target).abs().pow(2) * cell_weight[..., None]).sum() / num_pos
    total = cls_loss + BOX_WEIGHT * box_loss
    return total, cls_loss.detach(), box_loss.detach()
