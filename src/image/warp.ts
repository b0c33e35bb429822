import type { Affine } from './geometry.js';
import { composeAffine, invertAffine } from './geometry.js';
import type { GrayImage } from './raster.js';
import { createGray } from './raster.js';

/**
 * Raster resampling under affine maps.
 * Coordinates are continuous: pixel (i, j) covers [i, i+1) x [j, j+1) and its centre is (i + 0.5, j + 0.5),
 * the same convention as Box, so transforming a box and warping an image agree to the sub-pixel.
 */

export type QuarterTurn = 0 | 90 | 180 | 270;

/** Rotation by `degrees` about (cx, cy); positive turns clockwise on screen (y grows downwards). */
export function rotationAbout(degrees: number, cx: number, cy: number): Affine {
  const r = (degrees * Math.PI) / 180;
  const cos = Math.cos(r);
  const sin = Math.sin(r);
  return { a: cos, b: -sin, c: cx - cos * cx + sin * cy, d: sin, e: cos, f: cy - sin * cx - cos * cy };
}

export function scaling(sx: number, sy: number = sx): Affine {
  return { a: sx, b: 0, c: 0, d: 0, e: sy, f: 0 };
}

export function translation(tx: number, ty: number): Affine {
  return { a: 1, b: 0, c: tx, d: 0, e: 1, f: ty };
}

/** Bilinear sample at continuous coordinates (pixel centres at +0.5); outside the image gives `fill`. */
export function sampleBilinear(img: GrayImage, x: number, y: number, fill = 255): number {
  const fx = x - 0.5;
  const fy = y - 0.5;
  const x0 = Math.floor(fx);
  const y0 = Math.floor(fy);
  const tx = fx - x0;
  const ty = fy - y0;
  const w = img.width;
  const h = img.height;
  const d = img.data;
  const at = (xx: number, yy: number): number => (xx >= 0 && yy >= 0 && xx < w && yy < h ? d[yy * w + xx] : fill);
  const top = at(x0, y0) * (1 - tx) + at(x0 + 1, y0) * tx;
  const bottom = at(x0, y0 + 1) * (1 - tx) + at(x0 + 1, y0 + 1) * tx;
  return top * (1 - ty) + bottom * ty;
}

/**
 * Resample `src` into a width x height raster; `destToSrc` maps output coordinates to source coordinates
 * (the inverse of how the content moves). Bilinear; outside the source is `fill` (paper by default).
 */
export function warpGray(src: GrayImage, destToSrc: Affine, width: number, height: number, fill = 255): GrayImage {
  const out = createGray(width, height, fill);
  const { a, b, c, d, e, f } = destToSrc;
  const sw = src.width;
  const sh = src.height;
  const s = src.data;
  for (let j = 0; j < height; j++) {
    const yc = j + 0.5;
    // Source coordinates of this row's first pixel centre, in index space (minus 0.5).
    let sx = a * 0.5 + b * yc + c - 0.5;
    let sy = d * 0.5 + e * yc + f - 0.5;
    let o = j * width;
    for (let i = 0; i < width; i++, o++, sx += a, sy += d) {
      const x0 = Math.floor(sx);
      const y0 = Math.floor(sy);
      if (x0 >= 0 && y0 >= 0 && x0 + 1 < sw && y0 + 1 < sh) {
        const tx = sx - x0;
        const ty = sy - y0;
        const p = y0 * sw + x0;
        const top = s[p] + (s[p + 1] - s[p]) * tx;
        const bottom = s[p + sw] + (s[p + sw + 1] - s[p + sw]) * tx;
        out.data[o] = Math.round(top + (bottom - top) * ty);
      } else if (x0 >= -1 && y0 >= -1 && x0 < sw && y0 < sh) {
        out.data[o] = Math.round(sampleBilinear(src, sx + 0.5, sy + 0.5, fill));
      }
    }
  }
  return out;
}

export interface Rotated {
  image: GrayImage;
  /** Maps coordinates of the input raster to coordinates of the rotated one. */
  transform: Affine;
}

/** Affine taking coordinates of a width x height raster to those of the raster turned `turn` degrees clockwise. */
export function quarterTurnAffine(turn: QuarterTurn, width: number, height: number): Affine {
  switch (turn) {
    case 0:
      return { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 };
    case 90:
      return { a: 0, b: -1, c: height, d: 1, e: 0, f: 0 };
    case 180:
      return { a: -1, b: 0, c: width, d: 0, e: -1, f: height };
    case 270:
      return { a: 0, b: 1, c: 0, d: -1, e: 0, f: width };
  }
}

/** Turn a raster clockwise by a multiple of 90 degrees, exactly (no resampling). */
export function rotateQuarter(img: GrayImage, turn: QuarterTurn): Rotated {
  const transform = quarterTurnAffine(turn, img.width, img.height);
  if (turn === 0) return { image: { width: img.width, height: img.height, data: img.data.slice() }, transform };
  const w = img.width;
  const h = img.height;
  const outW = turn === 180 ? w : h;
  const outH = turn === 180 ? h : w;
  const out = createGray(outW, outH);
  const s = img.data;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let nx: number;
      let ny: number;
      if (turn === 90) {
        nx = h - 1 - y;
        ny = x;
      } else if (turn === 180) {
        nx = w - 1 - x;
        ny = h - 1 - y;
      } else {
        nx = y;
        ny = w - 1 - x;
      }
      out.data[ny * outW + nx] = s[y * w + x];
    }
  }
  return { image: out, transform };
}

/**
 * Rotate a raster by a small angle about its centre, keeping its size (corners that come from outside are paper).
 * Positive degrees turn the content clockwise on screen.
 */
export function rotateGray(img: GrayImage, degrees: number, fill = 255): Rotated {
  const transform = rotationAbout(degrees, img.width / 2, img.height / 2);
  const image = warpGray(img, invertAffine(transform), img.width, img.height, fill);
  return { image, transform };
}

/** Map a point through several transforms applied in order. */
export function chainAffine(...steps: Affine[]): Affine {
  return steps.reduce((acc, t) => composeAffine(t, acc), { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 });
}
