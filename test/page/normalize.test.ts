import { describe, expect, it } from 'vitest';
import { normalizePage } from '../../src/page/normalize.js';
import { detectOrientation } from '../../src/page/orientation.js';
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
    // Upright Latin text has clearly more ascenders than descenders (common practice); measured about 2:1 here.
    expect(o.up).toBeGreaterThan(1.5 * o.down);
  });
});
