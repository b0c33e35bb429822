import { describe, expect, it } from 'vitest';
import { alignByImage } from '../../src/page/align-image.js';
import { alignPage } from '../../src/page/align.js';
import { deskew } from '../../src/page/deskew.js';
import { applyAffine, composeAffine, invertAffine } from '../../src/image/geometry.js';
import { rotateGray } from '../../src/image/warp.js';
import type { Affine, Point } from '../../src/image/geometry.js';
import { filledRealForm, scanLike } from './fill-real-form.js';
import { realBlank } from './real-form.js';

/** Largest distance between two transforms' images of points spread over the form (page pixels). */
function maxDisagreement(t: Affine, truth: Affine, pts: Point[]): number {
  return Math.max(...pts.map((p) => {
    const a = applyAffine(t, p);
    const b = applyAffine(truth, p);
    return Math.hypot(a[0] - b[0], a[1] - b[1]);
  }));
}

const SPREAD: Point[] = [[150, 150], [1550, 150], [150, 2050], [1550, 2050], [850, 1100]];

describe('alignByImage: filled real form scanned by libvips at another scale and offset', () => {
  // Truth comes from sharp's resize and composite offsets; 1.5 px at 200 dpi is a fifth of a millimetre,
  // well inside a field's padding (common practice for registration accuracy on forms).
  for (const [s, left, top] of [[0.93, 35, -20], [1.12, -40, 30], [0.6, 12, 8]] as const) {
    it(`recovers scale ${s}, offset (${left}, ${top})`, async () => {
      const ref = await realBlank();
      const scan = await scanLike(await filledRealForm(), s, left, top);
      const a = alignByImage(scan.page, ref);
      expect(a.method).toBe('image');
      expect(maxDisagreement(a.refToPage, scan.refToPage, SPREAD)).toBeLessThan(1.5);
      expect(a.score).toBeGreaterThan(0.8);
    });
  }
});

describe('alignPage: the full chain on a turned scan', () => {
  it('deskews, then registers the filled real form to its blank within 2 px', async () => {
    const ref = await realBlank();
    const scan = await scanLike(await filledRealForm(), 0.95, 20, -15);
    // Turn the scan 2.5° clockwise about its centre; the truth composes the two known maps.
    const turned = rotateGray(scan.page, 2.5);
    const truth = composeAffine(turned.transform, scan.refToPage);
    const d = deskew(turned.image);
    expect(Math.abs(d.skew - 2.5)).toBeLessThan(0.1);
    const a = alignPage({ page: d.image, referenceSize: ref, reference: ref });
    // Reference points carried onto the deskewed page, then back onto the turned page, must land on the truth.
    const refToTurned = composeAffine(invertAffine(d.transform), a.refToPage);
    expect(maxDisagreement(refToTurned, truth, SPREAD)).toBeLessThan(2);
  });
});
