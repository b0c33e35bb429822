import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { handwrittenDigit } from '../../src/synth/handwritten-digits.js';
import { classCount, mnistDigit, TEST_SHARE, testIndices, testStart, trainIndices } from '../../src/synth/mnist-digits.js';
import { Rng } from '../../src/synth/prng.js';

describe('MNIST split', () => {
  it('keeps the last 15 % of each class, by package index, as the test split', () => {
    expect(TEST_SHARE).toBe(0.15);
    expect(testStart(1001)).toBe(850);
    for (let d = 0; d <= 9; d++) {
      const test = testIndices(d);
      const train = trainIndices(d);
      expect(train.length + test.length).toBe(classCount(d));
      expect(test[0]).toBe(train[train.length - 1] + 1);
      expect(test.length / classCount(d)).toBeGreaterThan(0.149);
      expect(test.length / classCount(d)).toBeLessThan(0.152);
    }
    // The package holds 10 000 digits (its README: "It includes 10000 different samples of mnist digits").
    expect(Array.from({ length: 10 }, (_, d) => classCount(d)).reduce((a, b) => a + b, 0)).toBe(10000);
  });
});

describe('handwrittenDigit', () => {
  it('draws only test-split digits, as a PNG whose alpha is the digit (decoded by sharp)', async () => {
    const rng = new Rng(5);
    for (let i = 0; i < 20; i++) {
      const d = handwrittenDigit(String(i % 10), { x: 0, y: 0, w: 40, h: 50 }, rng, { ink: 20 });
      expect(testIndices(d.source.digit)).toContain(d.source.index);
      expect(d.box.w).toBeLessThanOrEqual(44);
    }
    const d = handwrittenDigit('7', { x: 10, y: 10, w: 40, h: 50 }, new Rng(1), { ink: 20 });
    const meta = await sharp(d.png).metadata();
    expect([meta.width, meta.height, meta.channels, meta.hasAlpha]).toEqual([28, 28, 2, true]);
    // sharp hands raw pixels out as RGBA: gray in R, G, B and the stroke in A.
    const { data, info } = await sharp(d.png).raw().toBuffer({ resolveWithObject: true });
    const pixels = mnistDigit(7, d.source.index);
    for (let i = 0; i < 28 * 28; i++) {
      expect(data[i * info.channels]).toBe(20);
      expect(data[i * info.channels + info.channels - 1]).toBe(pixels[i]);
    }
  });

  it('refuses a training-split index and a non-digit', () => {
    expect(() => handwrittenDigit('3', { x: 0, y: 0, w: 40, h: 50 }, new Rng(1), { index: 0 })).toThrow(/not in the MNIST test split/);
    expect(() => handwrittenDigit('x', { x: 0, y: 0, w: 40, h: 50 }, new Rng(1))).toThrow(/0-9/);
  });
});
