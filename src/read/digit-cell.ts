import type { GrayImage } from '../image/raster.js';

/**
 * How one form cell becomes the digit reader's input; training/digits/cells.py mirrors it step for step, and the
 * model's `normalisation` metadata carries the constants so a retrained model says what it expects.
 */
export interface CellNormalisation {
  /** Quantile of the cell's gray levels taken as the paper (0..1). */
  paperPercentile: number;
  /** Quantile taken as the darkest ink. */
  darkPercentile: number;
  /** Least paper-to-dark difference (8-bit levels) a cell is stretched by, so scan noise in an empty cell stays faint. */
  minContrast: number;
}

/** The values the shipped model was trained with (training/digits/cells.py). */
export const DEFAULT_NORMALISATION: CellNormalisation = { paperPercentile: 0.9, darkPercentile: 0.02, minContrast: 80 };

/** Gray level at quantile q of an 8-bit raster (the smallest level with at least q of the pixels at or under it). */
function quantile(hist: Uint32Array, total: number, q: number): number {
  const target = q * (total - 1);
  let seen = 0;
  for (let v = 0; v < 256; v++) {
    seen += hist[v];
    if (seen > target) return v;
  }
  return 255;
}

/**
 * One cell's gray pixels -> the model input (size x size floats, ink 0..1, 0 = paper): per-cell normalisation
 * (ink = clamp((paper - v) / max(paper - dark, minContrast))), then the cell is fitted into the square keeping
 * its aspect ratio (area averaging), centred, padded with 0.
 */
export function cellInput(cell: GrayImage, size: number, norm: CellNormalisation = DEFAULT_NORMALISATION, out = new Float32Array(size * size)): Float32Array {
  out.fill(0);
  const { width: w, height: h, data } = cell;
  if (w <= 0 || h <= 0) return out;
  const hist = new Uint32Array(256);
  for (let i = 0; i < data.length; i++) hist[data[i]]++;
  const paper = quantile(hist, data.length, norm.paperPercentile);
  const dark = quantile(hist, data.length, norm.darkPercentile);
  const scale = Math.max(paper - dark, norm.minContrast);
  const s = size / Math.max(w, h);
  const ow = Math.max(1, Math.round(w * s));
  const oh = Math.max(1, Math.round(h * s));
  const ox = Math.floor((size - ow) / 2);
  const oy = Math.floor((size - oh) / 2);
  // Area averaging: each output pixel is the mean of the source area it covers (fractional edges weighted).
  const fx = w / ow, fy = h / oh;
  for (let y = 0; y < oh; y++) {
    const sy0 = y * fy, sy1 = sy0 + fy;
    for (let x = 0; x < ow; x++) {
      const sx0 = x * fx, sx1 = sx0 + fx;
      let sum = 0, area = 0;
      for (let yy = Math.floor(sy0); yy < Math.min(h, Math.ceil(sy1)); yy++) {
        const wy = Math.min(yy + 1, sy1) - Math.max(yy, sy0);
        if (wy <= 0) continue;
        for (let xx = Math.floor(sx0); xx < Math.min(w, Math.ceil(sx1)); xx++) {
          const wx = Math.min(xx + 1, sx1) - Math.max(xx, sx0);
          if (wx <= 0) continue;
          const ink = (paper - data[yy * w + xx]) / scale;
          sum += wx * wy * (ink < 0 ? 0 : ink > 1 ? 1 : ink);
          area += wx * wy;
        }
      }
      out[(oy + y) * size + ox + x] = area > 0 ? sum / area : 0;
    }
  }
  return out;
}
