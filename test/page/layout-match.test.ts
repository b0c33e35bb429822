import { describe, expect, it } from 'vitest';
import { alignByImage } from '../../src/page/align-image.js';
import { matchLayout } from '../../src/page/layout-match.js';
import { grayFromImage } from '../../src/image/raster.js';
import { filledRealForm, scanLike } from './fill-real-form.js';
import { realBlank } from './real-form.js';

describe('matchLayout', () => {
  it('assigns the filled real form to its own blank among the demo blanks', async () => {
    const w4 = await realBlank();
    const candidates = [
      { name: 'w4', reference: w4, referenceSize: w4 },
      ...(await Promise.all(
        ['clinic-intake', 'marina-slip', 'garden-plot'].map(async (name) => {
          const reference = await grayFromImage(`schemas/${name}.blank.png`);
          return { name, reference, referenceSize: reference };
        }),
      )),
    ];
    const scan = await scanLike(await filledRealForm(), 0.9, 20, -10);
    const m = matchLayout(scan.page, candidates);
    expect(m.best).toBe('w4');
    expect(m.margin).toBeGreaterThan(0.3);
  });

  it('calls a page of an unknown layout unknown_layout', async () => {
    const scan = await scanLike(await filledRealForm(), 0.9, 20, -10);
    const candidates = await Promise.all(
      ['clinic-intake', 'marina-slip', 'garden-plot'].map(async (name) => {
        const reference = await grayFromImage(`schemas/${name}.blank.png`);
        return { name, reference, referenceSize: reference };
      }),
    );
    const m = matchLayout(scan.page, candidates);
    expect(m.best).toBeNull();
    expect(m.reason).toBe('unknown_layout');
  });

  it('gives no credit to a fit that squeezes the reference into a corner of the page', async () => {
    const w4 = await realBlank();
    const scan = await scanLike(await filledRealForm(), 1, 0, 0);
    // Started from a transform that shrinks the blank to a third in the page's blank bottom margin.
    const a = alignByImage(scan.page, w4, { initialRefToPage: { a: 0.35, b: 0, c: 100, d: 0, e: 0.35, f: 1900 }, levels: [150] });
    expect(a.score).toBe(0);
  });
});
