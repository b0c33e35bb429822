import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { applyAffine } from '../../src/image/geometry.js';
import { fromRawBuffer } from '../../src/image/raster.js';
import { rotateGray, rotateQuarter } from '../../src/image/warp.js';
import { REAL_BLANK } from './real-form.js';

describe('rotateQuarter against libvips', () => {
  // sharp.rotate(n*90) is an exact, independent implementation of quarter turns (clockwise).
  for (const turn of [90, 180, 270] as const) {
    it(`turns ${turn}° clockwise pixel for pixel`, async () => {
      const small = await sharp(REAL_BLANK).grayscale().resize(170, 220).raw().toBuffer({ resolveWithObject: true });
      const img = fromRawBuffer(small.data, small.info.width, small.info.height, small.info.channels);
      const ours = rotateQuarter(img, turn);
      const theirs = await sharp(small.data, { raw: { width: 170, height: 220, channels: 1 } }).rotate(turn).grayscale().raw().toBuffer({ resolveWithObject: true });
      expect([ours.image.width, ours.image.height]).toEqual([theirs.info.width, theirs.info.height]);
      expect(Buffer.from(ours.image.data).equals(theirs.data.subarray(0, ours.image.data.length))).toBe(true);
      // The transform maps the top-left pixel's centre onto where that pixel landed.
      const [x, y] = applyAffine(ours.transform, [0.5, 0.5]);
      expect(ours.image.data[Math.floor(y) * ours.image.width + Math.floor(x)]).toBe(img.data[0]);
    });
  }
});

describe('rotateGray', () => {
  it('moves a dot where the rotation transform says', () => {
    const img = { width: 200, height: 100, data: new Uint8Array(200 * 100).fill(255) };
    for (let y = 20; y < 24; y++) for (let x = 160; x < 164; x++) img.data[y * 200 + x] = 0;
    const r = rotateGray(img, 6);
    const [cx, cy] = applyAffine(r.transform, [162, 22]);
    expect(r.image.data[Math.floor(cy) * 200 + Math.floor(cx)]).toBeLessThan(64);
  });
});
