import { describe, expect, it } from 'vitest';
import { contextCrop, cropField, paddingPixels } from '../../src/read/crop.js';
import { createGray } from '../../src/image/raster.js';

/** A page whose pixel values encode their column, so a crop's position can be read back from its pixels. */
function columnCoded(width: number, height: number) {
  const page = createGray(width, height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) page.data[y * width + x] = x;
  return page;
}

describe('cropField', () => {
  it('pads by pixels or by a percentage of the shorter side', () => {
    // Schema contract: a number is pixels, "N%" is N % of the box's shorter side (src/schema/definition.ts Padding).
    expect(paddingPixels({ x: 0, y: 0, w: 200, h: 40 }, 6)).toBe(6);
    expect(paddingPixels({ x: 0, y: 0, w: 200, h: 40 }, '25%')).toBe(10);
    expect(() => paddingPixels({ x: 0, y: 0, w: 10, h: 10 }, 'ten')).toThrow(/"N%"/);
  });

  it('cuts the padded box from the page and reports where the field sits inside the crop', () => {
    const page = columnCoded(200, 100);
    const c = cropField(page, { x: 50, y: 20, w: 60, h: 30 }, 5);
    expect(c.pageBox).toEqual({ x: 45, y: 15, w: 70, h: 40 });
    expect(c.inner).toEqual({ x: 5, y: 5, w: 60, h: 30 });
    // The crop's first pixel is the page's column 45 (values encode columns).
    expect(c.image.data[0]).toBe(45);
    expect(c.image.width).toBe(70);
  });

  it('clamps the padding at the page edges', () => {
    const page = columnCoded(200, 100);
    const c = cropField(page, { x: 2, y: 90, w: 40, h: 10 }, 8);
    expect(c.pageBox).toEqual({ x: 0, y: 82, w: 50, h: 18 });
    expect(c.inner).toEqual({ x: 2, y: 8, w: 40, h: 10 });
    expect(() => cropField(page, { x: 300, y: 10, w: 10, h: 10 }, 0)).toThrow(/outside the 200x100 page/);
  });

  it('context crops show a box-height of surroundings', () => {
    const page = columnCoded(400, 300);
    const c = contextCrop(page, { x: 100, y: 100, w: 120, h: 40 });
    expect(c.pageBox).toEqual({ x: 60, y: 60, w: 200, h: 120 });
  });
});
