import { describe, expect, it } from 'vitest';
import type { Affine } from '../../src/image/geometry.js';
import { composeAffine, iou, transformBox } from '../../src/image/geometry.js';
import { refineRegion } from '../../src/page/local-refine.js';
import { translation } from '../../src/image/warp.js';
import { filledRealForm, scanLike } from './fill-real-form.js';
import { realBlank } from './real-form.js';

describe('refineRegion on the filled real form', () => {
  // Truth: the libvips scan geometry. The alignment handed in is off by a local drift of (7, -5) reference
  // pixels, as at the corner of a sheet that did not lie flat.
  it('brings drifted regions back onto their cells and checkboxes', async () => {
    const ref = await realBlank();
    const scan = await scanLike(await filledRealForm(), 0.97, 12, -9);
    const drifted: Affine = composeAffine(scan.refToPage, translation(7, -5));
    const regions = [
      { x: 261, y: 233, w: 499, h: 67 }, // first name cell
      { x: 319, y: 438, w: 24, h: 24 }, // "Single" checkbox
      { x: 1279, y: 1830, w: 322, h: 52 }, // date line
    ];
    for (const r of regions) {
      const truth = transformBox(scan.refToPage, r);
      const before = iou(transformBox(drifted, r), truth);
      const out = refineRegion(scan.page, ref, drifted, r);
      expect(out.shift).toEqual([-7, 5]);
      expect(iou(out.box, truth)).toBeGreaterThan(0.9);
      expect(iou(out.box, truth)).toBeGreaterThan(before);
    }
  });

  it('keeps the region where no shift correlates (a region over blank paper)', async () => {
    const ref = await realBlank();
    const scan = await scanLike(await filledRealForm(), 1, 0, 0);
    const r = { x: 1630, y: 1500, w: 40, h: 40 };
    const out = refineRegion(scan.page, ref, scan.refToPage, r);
    expect(out.shift).toEqual([0, 0]);
  });
});
