import { describe, expect, it } from 'vitest';
import { letterbox, letterboxGeometry } from '../../src/detect/letterbox.js';
import { transformBox } from '../../src/image/geometry.js';
import { createGray } from '../../src/image/raster.js';

describe('letterbox geometry', () => {
  it('fits a square page into a 96x64 input, at the top-left or centred', () => {
    // scale = min(96/300, 64/300) = 64/300; scaled page 64 x 64; centred: padding (96 − 64)/2 = 16 on the left
    const g = letterboxGeometry(300, 300, 96, 64);
    expect([g.resizedWidth, g.resizedHeight, g.padX, g.padY]).toEqual([64, 64, 0, 0]);
    expect(transformBox(g.toInput, { x: 75, y: 150, w: 75, h: 75 })).toEqual({ x: 16, y: 32, w: 16, h: 16 });
    const c = letterboxGeometry(300, 300, 96, 64, 'center');
    expect([c.padX, c.padY]).toEqual([16, 0]);
    expect(transformBox(c.toInput, { x: 75, y: 150, w: 75, h: 75 })).toEqual({ x: 32, y: 32, w: 16, h: 16 });
  });

  it('maps boxes to the input and back to page pixels within 1 px, for many page sizes', () => {
    // Requirement from the issue: the letterbox mapping round-trips boxes to within 1 px.
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const pages: [number, number][] = [[2550, 3300], [1700, 2200], [3300, 2550], [123, 457], [640, 640], [50, 30]];
    for (const [[w, h], align] of pages.flatMap((p) => [[p, 'top-left'], [p, 'center']] as const)) {
      const g = letterboxGeometry(w, h, 640, 480, align);
      for (let i = 0; i < 50; i++) {
        const box = { x: rand() * w * 0.8, y: rand() * h * 0.8, w: 1 + rand() * w * 0.2, h: 1 + rand() * h * 0.2 };
        const back = transformBox(g.toSource, transformBox(g.toInput, box));
        for (const k of ['x', 'y', 'w', 'h'] as const) expect(Math.abs(back[k] - box[k])).toBeLessThanOrEqual(1);
      }
    }
  });
});

describe('letterbox on real pixels', () => {
  it('pads with white 1.0 and finds drawn rectangles back within 1 page pixel', async () => {
    // 192 x 128 page into 96 x 64: scale 0.5, no padding. Rectangles at random (odd and even) positions; the ink
    // box found in the resized tensor, mapped back, must be within 1 page pixel of the drawn one.
    let seed = 11;
    const rand = (n: number) => Math.floor(((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) * n);
    for (let trial = 0; trial < 8; trial++) {
      const page = createGray(192, 128);
      const drawn = { x: 10 + rand(100), y: 10 + rand(60), w: 12 + rand(60), h: 12 + rand(40) };
      for (let y = drawn.y; y < drawn.y + drawn.h; y++) page.data.fill(0, y * 192 + drawn.x, y * 192 + drawn.x + drawn.w);
      const lb = await letterbox(page, 96, 64);
      let [x0, y0, x1, y1] = [Infinity, Infinity, -Infinity, -Infinity];
      for (let y = 0; y < 64; y++) {
        for (let x = 0; x < 96; x++) {
          if (lb.tensor[y * 96 + x] < 0.5) [x0, y0, x1, y1] = [Math.min(x0, x), Math.min(y0, y), Math.max(x1, x + 1), Math.max(y1, y + 1)];
        }
      }
      const back = transformBox(lb.toSource, { x: x0, y: y0, w: x1 - x0, h: y1 - y0 });
      expect(Math.abs(back.x - drawn.x)).toBeLessThanOrEqual(1);
      expect(Math.abs(back.y - drawn.y)).toBeLessThanOrEqual(1);
      expect(Math.abs(back.x + back.w - (drawn.x + drawn.w))).toBeLessThanOrEqual(1);
      expect(Math.abs(back.y + back.h - (drawn.y + drawn.h))).toBeLessThanOrEqual(1);
    }
  });

  it('fills the rest of the input with paper white', async () => {
    const page = createGray(100, 400, 0); // all ink
    const top = await letterbox(page, 96, 64); // scale 0.16: 16 x 64 page at x 0..16
    expect([top.resizedWidth, top.resizedHeight, top.padX, top.padY]).toEqual([16, 64, 0, 0]);
    expect(top.tensor[30 * 96 + 8]).toBe(0); // inside the page
    expect(top.tensor[30 * 96 + 16]).toBe(1); // right of it
    const mid = await letterbox(page, 96, 64, 'center'); // page at x 40..56
    expect(mid.padX).toBe(40);
    expect([mid.tensor[30 * 96 + 5], mid.tensor[30 * 96 + 48], mid.tensor[30 * 96 + 95]]).toEqual([1, 0, 1]);
  });
});
