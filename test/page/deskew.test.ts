import { describe, expect, it } from 'vitest';
import { deskew, estimateSkew } from '../../src/page/deskew.js';
import { REAL_BLANK, rotatedBySharp } from './real-form.js';

describe('estimateSkew on the real blank form turned by libvips', () => {
  // The reference angle is the one libvips (sharp.rotate, positive = clockwise) turned the page by; the
  // 0.1° tolerance is half of the project target (median error <= 0.2°).
  for (const angle of [-7.5, -2.25, 0.6, 4.8, 9.3]) {
    it(`finds ${angle}°`, async () => {
      const page = await rotatedBySharp(REAL_BLANK, angle);
      const est = estimateSkew(page);
      expect(Math.abs(est.angle - angle)).toBeLessThan(0.1);
      expect(est.confidence).toBeGreaterThan(0.3);
    });
  }

  it('deskew leaves a page whose remaining skew is near zero', async () => {
    const page = await rotatedBySharp(REAL_BLANK, -3.4);
    const out = deskew(page);
    expect(Math.abs(out.skew + 3.4)).toBeLessThan(0.1);
    expect(Math.abs(estimateSkew(out.image).angle)).toBeLessThan(0.1);
    expect(out.image.width).toBe(page.width);
  });

  it('reports no evidence on a blank sheet', () => {
    const blank = { width: 400, height: 500, data: new Uint8Array(400 * 500).fill(250) };
    const est = estimateSkew(blank);
    expect(est.angle).toBe(0);
    expect(est.confidence).toBe(0);
  });
});
