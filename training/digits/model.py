"""The digit reader's network: a small CNN for one form cell (32 x 32 ink map) -> 12 classes."""

from __future__ import annotations

import torch
from torch import nn


def _block(cin: int, cout: int) -> nn.Sequential:
    return nn.Sequential(nn.Conv2d(cin, cout, 3, padding=1, bias=False), nn.BatchNorm2d(cout), nn.ReLU(inplace=True))


class DigitCellCNN(nn.Module):
    """Five 3 x 3 conv layers (16-32-48-64-64 channels, three 2 x 2 max pools), 4 x 4 x 64 features, one linear layer.
    About 4.6 M multiply-adds per cell and 96 k parameters."""

    def __init__(self, classes: int = 12) -> None:
        super().__init__()
        self.features = nn.Sequential(
            _block(1, 16), nn.MaxPool2d(2),  # 16 x 16
            _block(16, 32), nn.MaxPool2d(2),  # 8 x 8
            _block(32, 48), _block(48, 64), nn.MaxPool2d(2),  # 4 x 4
            _block(64, 64),
        )
        self.head = nn.Sequential(nn.Flatten(), nn.Dropout(0.2), nn.Linear(64 * 16, classes))

    def forward(self, x: torch.Tensor) -> torch.Tensor:
        return self.head(self.features(x))


class Softmaxed(nn.Module):
    """Export wrapper: class probabilities instead of logits."""

    def __init__(self, net: DigitCellCNN) -> None:
        super().__init__()
        self.net = net

    def forward(self, x: torch.Tensor) -> torch.Tensor:
        return torch.softmax(self.net(x), dim=1)
