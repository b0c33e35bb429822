import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { createGray, fromRawBuffer, sharpFromGray } from '../../src/image/raster.js';
import { applyH, composeH, invertH, rotateH, scaleH, translateH } from '../../src/synth/homography.js';
import { warpByHomography } from '../../src/synth/scan-simulate.js';

/** Centroid of dark pixels. */
function inkCentroid(img: { width: number; height: number; data: Uint8Array }): [number, number] {
  let sx = 0;
  let sy = 0;
  let n = 0;
  for (let y = 0; y < img.height; y++)
    for (let x = 0; x < img.width; x++)
      if (img.data[y * img.width + x] < 128) {
        sx += x + 0.5;
        sy += y + 0.5;
        n++;
      }
  return [sx / n, sy / n];
}

/** A white page with one black square. */
function dotPage(): ReturnType<typeof createGray> {
  const img = createGray(400, 300);
  for (let y = 60; y < 80; y++) for (let x = 300; x < 320; x++) img.data[y * 400 + x] = 0;
  return img;
}

describe('scan geometry', () => {
  it('rotates the same way as libvips: positive degrees turn the content clockwise on screen', async () => {
    // sharp/libvips rotate(angle) about the image centre on an enlarged canvas is the outside reference here.
    const src = dotPage();
    const angle = 12;
    const { data, info } = await sharpFromGray(src).rotate(angle, { background: '#ffffff' }).raw().toBuffer({ resolveWithObject: true });
    const byVips = fromRawBuffer(data, info.width, info.height, info.channels);
    const [vx, vy] = inkCentroid(byVips);
    const h = composeH(translateH(-200, -150), rotateH(angle), translateH(info.width / 2, info.height / 2));
    const ours = warpByHomography(src, h, info.width, info.height);
    const [ox, oy] = inkCentroid(ours);
    const [px, py] = applyH(h, 310, 70);
    expect(Math.hypot(ox - vx, oy - vy)).toBeLessThan(1.5);
    expect(Math.hypot(px - vx, py - vy)).toBeLessThan(1.5);
  });

  it('warped pixels land where the transform sends their coordinates (the rule truth boxes follow)', () => {
    const src = dotPage();
    const h = composeH(translateH(-200, -150), [1, 0, 0, 0, 1, 0, 0.0002, -0.0001, 1], scaleH(1.25), rotateH(-2.5), translateH(250, 190));
    const out = warpByHomography(src, h, 500, 380);
    const [cx, cy] = inkCentroid(out);
    const [px, py] = applyH(h, 310, 70);
    expect(Math.hypot(cx - px, cy - py)).toBeLessThan(1);
    const back = applyH(invertH(h), px, py);
    expect(back[0]).toBeCloseTo(310, 6);
    expect(back[1]).toBeCloseTo(70, 6);
  });

  it('scales like libvips resize at 1.5x', async () => {
    const src = dotPage();
    const { data, info } = await sharpFromGray(src).resize(600, 450, { kernel: 'linear' }).raw().toBuffer({ resolveWithObject: true });
    const [vx, vy] = inkCentroid(fromRawBuffer(data, info.width, info.height, info.channels));
    const [ox, oy] = inkCentroid(warpByHomography(src, scaleH(1.5), 600, 450));
    expect(Math.hypot(ox - vx, oy - vy)).toBeLessThan(1);
    expect(Math.hypot(ox - 465, oy - 105)).toBeLessThan(1);
  });
});
