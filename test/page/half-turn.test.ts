import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { confirmHalfTurn } from '../../src/page/half-turn.js';
import { normalizePage } from '../../src/page/normalize.js';
import { fromRawBuffer } from '../../src/image/raster.js';
import { filledRealForm } from './fill-real-form.js';
import { realBlank } from './real-form.js';

describe('confirmHalfTurn against the real blank', () => {
  it('turns an upside-down page whose text the orientation cue cannot read, and leaves an upright one', async () => {
    const ref = await realBlank();
    // Heavy blur merges the form's 8-point letters, which defeats the ascender count; libvips turns the page.
    const blurred = await sharp(await filledRealForm()).rotate(180).blur(1.6).grayscale().raw().toBuffer({ resolveWithObject: true });
    const page = fromRawBuffer(blurred.data, blurred.info.width, blurred.info.height, blurred.info.channels);
    const n = normalizePage(page, { orientation: false });
    const c = confirmHalfTurn(n, ref);
    expect(c.flipped).toBe(true);
    expect(c.page.rotation).toBe(180);
    // Upright, the page correlates with its blank; turned, it does not (measured 0.96 vs 0.17 on bench/real-form-page.ts).
    expect(c.turnedScore).toBeGreaterThan(0.8);
    expect(c.score).toBeLessThan(0.4);
    const again = confirmHalfTurn(c.page, ref);
    expect(again.flipped).toBe(false);
  });
});
