import { describe, expect, it } from 'vitest';
import { nonMaxSuppression } from '../../src/detect/nms.js';
import { iou } from '../../src/image/geometry.js';

// Source: the definition IoU = |A ∩ B| / |A ∪ B| (areas in the continuous pixel convention, a box covers [x, x+w)).
describe('IoU worked by hand from the definition', () => {
  it('two 4x4 boxes offset by (2, 2)', () => {
    // intersection 2 × 2 = 4; union 16 + 16 − 4 = 28; IoU = 4/28 = 1/7
    expect(iou({ x: 0, y: 0, w: 4, h: 4 }, { x: 2, y: 2, w: 4, h: 4 })).toBeCloseTo(1 / 7, 12);
  });
  it('two 10x10 boxes offset by half their width', () => {
    // intersection 5 × 10 = 50; union 100 + 100 − 50 = 150; IoU = 1/3
    expect(iou({ x: 0, y: 0, w: 10, h: 10 }, { x: 5, y: 0, w: 10, h: 10 })).toBeCloseTo(1 / 3, 12);
  });
  it('touching and disjoint boxes have IoU 0; identical boxes 1', () => {
    expect(iou({ x: 0, y: 0, w: 10, h: 10 }, { x: 10, y: 0, w: 10, h: 10 })).toBe(0);
    expect(iou({ x: 0, y: 0, w: 10, h: 10 }, { x: 30, y: 30, w: 5, h: 5 })).toBe(0);
    expect(iou({ x: 3, y: 4, w: 10, h: 10 }, { x: 3, y: 4, w: 10, h: 10 })).toBe(1);
  });
});

// Source: greedy class-wise non-maximum suppression as commonly described (common practice): highest score first,
// drop a box whose IoU with a kept box of the same class exceeds the threshold; suppressed boxes suppress nothing.
describe('non-maximum suppression worked by hand', () => {
  const c = (id: string, x: number, y: number, score: number, classId = 0) => ({ id, box: { x, y, w: 10, h: 10 }, classId, score });
  const candidates = [
    c('d', 20, 20, 0.6), // far from all: kept
    c('b', 1, 0, 0.8), // vs a: ∩ 9×10 = 90, ∪ 110, IoU 0.818 > 0.5: suppressed
    c('a', 0, 0, 0.9), // highest: kept
    c('h', 3.5, 0, 0.75), // vs a: ∩ 6.5×10 = 65, ∪ 135, IoU 0.481: kept (b, IoU 0.6, is already suppressed)
    c('c', 5, 0, 0.7), // vs a: 1/3; vs h: ∩ 8.5×10 = 85, ∪ 115, IoU 0.739 > 0.5: suppressed
    c('e', 0, 0, 0.5, 1), // same place as a but another class: kept
  ];

  it('keeps a, h, d and the other-class e, by descending score', () => {
    expect(nonMaxSuppression(candidates, 0.5, 300).map((k) => k.id)).toEqual(['a', 'h', 'd', 'e']);
  });
  it('caps the number kept', () => {
    expect(nonMaxSuppression(candidates, 0.5, 2).map((k) => k.id)).toEqual(['a', 'h']);
  });
  it('a looser threshold keeps more', () => {
    // 0.85 is above every pairwise IoU here (largest 0.818), so nothing is suppressed
    expect(nonMaxSuppression(candidates, 0.85, 300).map((k) => k.id)).toEqual(['a', 'b', 'h', 'c', 'd', 'e']);
  });
  it('IoU exactly at the threshold is not suppressed (strictly greater suppresses)', () => {
    // 30x10 boxes offset by 10: ∩ 20×10 = 200, ∪ 300 + 300 − 200 = 400, IoU = 0.5 exactly
    const pair = [
      { box: { x: 0, y: 0, w: 30, h: 10 }, classId: 0, score: 0.9 },
      { box: { x: 10, y: 0, w: 30, h: 10 }, classId: 0, score: 0.8 },
    ];
    expect(nonMaxSuppression(pair, 0.5, 300)).toHaveLength(2);
    expect(nonMaxSuppression(pair, 0.49, 300)).toHaveLength(1);
  });
});
