import { describe, expect, it } from 'vitest';
import { decodeOutput, layoutsFitting, resolveLayout } from '../../src/detect/decode.js';

// Layouts as the project's model contract states them (COMMON vocabulary): [1, 4+C, N], [1, N, 5+C], [1, N, 6].
describe('output layout from the tensor shape', () => {
  it('tells the three layouts apart for 4 classes', () => {
    expect(resolveLayout([1, 8, 8400], 4)).toBe('xywh-scores');
    expect(resolveLayout([1, 25200, 9], 4)).toBe('xywh-objectness-scores');
    expect(resolveLayout([1, 100, 6], 4)).toBe('xyxy-score-class');
  });
  it('rejects shapes that fit none, and asks for a hint when several fit', () => {
    expect(() => resolveLayout([1, 3, 7], 4)).toThrow(/unexpected output shape \[1, 3, 7\]/);
    expect(() => resolveLayout([2, 8, 100], 4)).toThrow(/unexpected/);
    expect(() => resolveLayout([1, 6, 6], 2)).toThrow(/several layouts/);
    expect(resolveLayout([1, 6, 6], 2, 'xyxy-score-class')).toBe('xyxy-score-class');
    expect(() => resolveLayout([1, 8, 100], 4, 'xyxy-score-class')).toThrow(/does not fit/);
  });
  it('symbolic dimensions fit anything (the concrete shape at run time decides)', () => {
    expect(layoutsFitting([1, 8, 'N'], 4)).toEqual(['xywh-scores', 'xywh-objectness-scores', 'xyxy-score-class']);
    expect(layoutsFitting(['batch', 'N', 9], 4)).toEqual(['xywh-scores', 'xywh-objectness-scores']);
    expect(layoutsFitting([1, 5, 7], 4)).toEqual([]);
  });
});

describe('decoding candidates (values chosen by hand)', () => {
  it('[1, 4+C, N]: channel-major, best class per candidate', () => {
    // C = 2, N = 3; columns are candidates
    const data = Float32Array.from([
      /* cx */ 10, 50, 90,
      /* cy */ 20, 60, 95,
      /* w  */ 4, 10, 6,
      /* h  */ 8, 10, 6,
      /* s0 */ 0.3, 0.1, 0.2,
      /* s1 */ 0.1, 0.7, 0.1,
    ]);
    const out = decodeOutput(data, [1, 6, 3], 2, 0.25);
    expect(out).toEqual([
      { box: { x: 8, y: 16, w: 4, h: 8 }, classId: 0, score: expect.closeTo(0.3, 6) },
      { box: { x: 45, y: 55, w: 10, h: 10 }, classId: 1, score: expect.closeTo(0.7, 6) },
    ]);
  });
  it('[1, N, 5+C]: score is objectness × class score', () => {
    // C = 2, N = 2; rows are candidates
    const data = Float32Array.from([
      30, 30, 10, 20, 0.5, 0.2, 0.8, // 0.5 × 0.8 = 0.4, class 1
      70, 70, 10, 10, 0.9, 0.25, 0.1, // 0.9 × 0.25 = 0.225 < 0.25: dropped
    ]);
    const out = decodeOutput(data, [1, 2, 7], 2, 0.25);
    expect(out).toHaveLength(1);
    expect(out[0].box).toEqual({ x: 25, y: 20, w: 10, h: 20 });
    expect(out[0].classId).toBe(1);
    expect(out[0].score).toBeCloseTo(0.4, 6);
  });
  it('[1, N, 6]: corner boxes with class index; zero padding rows ignored; bad class index is an error', () => {
    const data = Float32Array.from([5, 6, 15, 26, 0.8, 1, 0, 0, 0, 0, 0, 0]);
    expect(decodeOutput(data, [1, 2, 6], 3, 0.25)).toEqual([
      { box: { x: 5, y: 6, w: 10, h: 20 }, classId: 1, score: expect.closeTo(0.8, 6) },
    ]);
    expect(() => decodeOutput(Float32Array.from([0, 0, 5, 5, 0.9, 7]), [1, 1, 6], 3, 0.25)).toThrow(/class index 7/);
  });
  it('drops empty and non-finite boxes', () => {
    const data = Float32Array.from([10, 10, 0, 5, 0.9, 1, NaN, 10, 5, 5, 0.9, 1]);
    expect(decodeOutput(data, [1, 2, 6], 2, 0.25)).toEqual([]);
  });
});
