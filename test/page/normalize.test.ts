import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { detectOrientation, normalizePage } from '../../src/page/normalize.js';
import { REAL_BLANK, rotatedBySharp } from './real-form.js';
import { filledRealForm } from './fill-real-form.js';

describe('normalizePage on the real form turned by libvips', () => {
  // libvips turns the page clockwise by quarter + small degrees; the upright page needs the opposite quarter turn
  // (clockwise, as the result contract counts it) and has the small angle left as skew.
  for (const [quarter, small] of [[0, -1.6], [90, 2.2], [180, 0.7], [270, -3.1]] as const) {
    it(`undoes ${quarter}° + ${small}°`, async () => {
      const page = await rotatedBySharp(REAL_BLANK, quarter + small);
      const n = normalizePage(page);
      expect(n.rotation).toBe((360 - quarter) % 360);
      expect(Math.abs(n.skew - small)).toBeLessThan(0.1);
    });
  }

  it('reads a filled page upside down from its text alone', async () => {
    const page = await rotatedBySharp(await filledRealForm(), 180);
    const o = detectOrientation(page);
    expect(o.rotation).toBe(180);
    // Upright Latin text has clearly more ink above its x-height band than below (common practice); measured
    // a mean phrase vote of 0.51 here.
    expect(o.upScore).toBeGreaterThan(0.3);
    expect(o.lines).toBeGreaterThan(50);
  });

  it('keeps reading up from down when blur merges the small letters', async () => {
    // The form's 8-point type at 200 dpi, blurred with sigma 1.6 by libvips: letters run together into words.
    const page = await rotatedBySharp(await sharp(await filledRealForm()).blur(1.6).png().toBuffer(), 180.8);
    const n = normalizePage(page);
    expect(n.rotation).toBe(180);
    expect(Math.abs(n.skew - 0.8)).toBeLessThan(0.1);
  });
});
