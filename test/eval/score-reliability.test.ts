import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { reliabilityPng } from '../../src/eval/reliability-diagram.js';
import { binIndex, reliability } from '../../src/eval/reliability.js';

describe('reliability bins and expected calibration error (Guo et al. 2017)', () => {
  // Definition: Guo, Pleiss, Sun, Weinberger (2017), "On Calibration of Modern Neural Networks", section 2:
  // bins I_m = ((m-1)/M, m/M], ECE = sum_m |B_m|/n |acc(B_m) - conf(B_m)|, MCE = max_m |acc(B_m) - conf(B_m)|.
  const data = [
    ...[true, true, true, false].map((correct) => ({ confidence: 0.95, correct })),
    { confidence: 0.75, correct: true },
    { confidence: 0.75, correct: false },
    { confidence: 0.7, correct: true }, // on the upper edge of (0.6, 0.7]
    { confidence: 0.7, correct: true },
    { confidence: 0.35, correct: true },
    { confidence: 0.35, correct: false },
  ];

  it('bins by right-closed intervals, edges included', () => {
    expect(binIndex(0.7, 10)).toBe(6); // (0.6, 0.7], even though 0.7 * 10 = 7.000000000000001 in floating point
    expect(binIndex(0.3, 10)).toBe(2); // (0.2, 0.3]
    expect(binIndex(0.30000001, 10)).toBe(3);
    expect(binIndex(1, 10)).toBe(9);
    expect(binIndex(0, 10)).toBe(0); // 0 belongs to no interval of the definition; it joins the first bin
  });

  it('computes ECE and MCE on hand-made data (hand computation, M = 10)', () => {
    // By hand, n = 10:
    //   (0.9, 1.0]: 4 samples, acc 0.75, conf 0.95, gap 0.20, weight 0.4 -> 0.08
    //   (0.7, 0.8]: 2 samples, acc 0.50, conf 0.75, gap 0.25, weight 0.2 -> 0.05
    //   (0.6, 0.7]: 2 samples, acc 1.00, conf 0.70, gap 0.30, weight 0.2 -> 0.06
    //   (0.3, 0.4]: 2 samples, acc 0.50, conf 0.35, gap 0.15, weight 0.2 -> 0.03
    //   ECE = 0.22, MCE = 0.30
    const r = reliability(data, 10);
    expect(r.ece).toBeCloseTo(0.22, 12);
    expect(r.mce).toBeCloseTo(0.3, 12);
    expect(r.bins.map((b) => b.count)).toEqual([0, 0, 0, 2, 0, 0, 2, 2, 0, 4]);
    expect(r.bins[9].accuracy).toBe(0.75);
    expect(r.bins[9].confidence).toBeCloseTo(0.95, 12);
    expect(r.bins[0].accuracy).toBeNull();
  });

  it('gives 0 for confidences that equal the observed accuracy, null without samples', () => {
    // 4 samples at 0.75 with 3 right: acc = conf in the single bin, so ECE = 0 by the definition.
    const calibrated = [true, true, true, false].map((correct) => ({ confidence: 0.75, correct }));
    expect(reliability(calibrated, 15).ece).toBe(0);
    expect(reliability([], 15).ece).toBeNull();
    expect(() => reliability([{ confidence: 1.2, correct: true }])).toThrow(/\[0, 1\]/);
  });

  it('draws the diagram as a PNG with a bar up to each bin accuracy', async () => {
    const png = await reliabilityPng(reliability(data, 10), { title: 'Reliability: test' });
    const img = sharp(png);
    const meta = await img.metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['png', 740, 780]);
    const { data: px, info } = await img.raw().toBuffer({ resolveWithObject: true });
    const at = (x: number, y: number): number[] => {
      const o = (Math.round(y) * info.width + Math.round(x)) * info.channels;
      return [px[o], px[o + 1], px[o + 2]];
    };
    // Plot geometry of reliability-diagram.ts: x = 80 + v * 610, y = 80 + (1 - v) * 480.
    const X = (v: number) => 80 + v * 610;
    const Y = (v: number) => 80 + (1 - v) * 480;
    // Bin (0.6, 0.7] has accuracy 1: its bar is blue-ish at accuracy 0.2 (b > r).
    const inBar = at(X(0.63), Y(0.2));
    expect(inBar[2]).toBeGreaterThan(inBar[0] + 40);
    // Bin (0.1, 0.2] is empty: white paper (grid lines aside) at the same height.
    const empty = at(X(0.13), Y(0.25));
    expect(Math.min(...empty)).toBeGreaterThan(200);
  });
});
