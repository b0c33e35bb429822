import { describe, expect, it } from 'vitest';
import { binarizeOtsu, histogram, otsuThreshold } from '../../src/image/otsu.js';
import { binarizeSauvola } from '../../src/image/sauvola.js';
import { createGray, type GrayImage } from '../../src/image/raster.js';

function imageOf(values: number[], width: number): GrayImage {
  return { width, height: values.length / width, data: Uint8Array.from(values) };
}

describe('Otsu threshold', () => {
  it('matches a hand-computed bimodal example', () => {
    // Otsu 1979: choose t maximizing sigma_B^2 = w0 w1 (mu0 - mu1)^2. Twelve pixels: 4 x 10, 2 x 20, 3 x 200, 3 x 220.
    //   t in [10, 20):  w0 = 4/12, mu0 = 10,     mu1 = 1300/8 = 162.5  -> sigma_B^2 = (1/3)(2/3)(152.5)^2 = 5168.1
    //   t in [20, 200): w0 = 6/12, mu0 = 13.33,  mu1 = 210            -> sigma_B^2 = (1/4)(196.67)^2      = 9669.4
    //   t in [200,220): w0 = 9/12, mu0 = 75.56,  mu1 = 220            -> sigma_B^2 = (3/16)(144.44)^2     = 3912.0
    // The maximum lies on [20, 200); the first level of that plateau is 20.
    const img = imageOf([10, 10, 10, 10, 20, 20, 200, 200, 200, 220, 220, 220], 4);
    expect(otsuThreshold(histogram(img))).toBe(20);
    // With the ink-share guard off (maxInkShare 1) the binarization is the plain Otsu split.
    expect(Array.from(binarizeOtsu(img, 0, 1).data)).toEqual([0, 0, 0, 0, 0, 0, 255, 255, 255, 255, 255, 255]);
  });

  it('splits ink from a tinted cell rather than the tint from the paper', () => {
    // Three levels: 10 % ink (20), 50 % tint (150), 40 % paper (245). Plain Otsu puts the tint with the ink; ink on a
    // form field covers a small share of the crop, so the split is repeated inside the dark class (recursive Otsu).
    const values = [...Array(10).fill(20), ...Array(50).fill(150), ...Array(40).fill(245)];
    const img = imageOf(values, 10);
    expect(otsuThreshold(histogram(img))).toBe(150);
    const bin = binarizeOtsu(img);
    expect(bin.data.filter((v) => v === 0).length).toBe(10);
  });

  it('has no split for a single gray level and leaves a low-contrast crop blank', () => {
    expect(otsuThreshold(histogram(createGray(5, 5, 240)))).toBe(-1);
    // Paper grain of 236..244: the two Otsu classes differ by far less than ink and paper (common practice: > 100 levels).
    const grain = imageOf(Array.from({ length: 64 }, (_, i) => 236 + (i * 7) % 9), 8);
    expect(binarizeOtsu(grain).data.every((v) => v === 255)).toBe(true);
  });
});

describe('Sauvola threshold', () => {
  it('follows uneven lighting that defeats one global threshold', () => {
    // Paper brightens from 90 on the left to 250 on the right; ink strokes sit 60 levels under the local paper.
    const w = 120, h = 30;
    const img = createGray(w, h);
    const isStroke = (x: number, y: number) => x % 20 >= 8 && x % 20 < 11 && y >= 8 && y < 22;
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        const paper = 90 + Math.round((160 * x) / (w - 1));
        img.data[y * w + x] = isStroke(x, y) ? paper - 60 : paper;
      }
    }
    const wrong = (b: GrayImage) => {
      let n = 0;
      for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) if ((b.data[y * w + x] === 0) !== isStroke(x, y)) n++;
      return n;
    };
    // Sauvola and Pietikainen 2000, T = m (1 + k (s/R - 1)): the local mean tracks the lighting.
    const sauvola = binarizeSauvola(img, { window: 15, k: 0.2 });
    const otsu = binarizeOtsu(img);
    expect(wrong(sauvola)).toBe(0);
    // A single global level cannot separate stroke 30..130 from paper 90..250 (they overlap).
    expect(wrong(otsu)).toBeGreaterThan(100);
  });
});
