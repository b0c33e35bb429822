import type { Affine } from './geometry.js';
import type { GrayImage } from './raster.js';

/**
 * Floating-point "ink maps" for intensity registration: 0 = paper, 1 = full ink, reduced by an integer factor
 * with area averaging. Coordinates stay continuous: level coordinate = full-resolution coordinate / factor.
 */
export interface InkMap {
  width: number;
  height: number;
  data: Float32Array;
  /** Full-resolution pixels per map pixel. */
  factor: number;
}

/** Area-average a raster down by an integer factor into an ink map (partial edge blocks average what exists). */
export function inkMapOf(img: GrayImage, factor: number): InkMap {
  const k = Math.max(1, Math.floor(factor));
  const w = Math.ceil(img.width / k);
  const h = Math.ceil(img.height / k);
  const out = new Float32Array(w * h);
  // Whole-number block sums in an integer row, one block row at a time: the same sums a float accumulator holds
  // exactly (at most 255 k^2, far under 2^24), so the map is the same, without a float read-modify-write per pixel.
  const acc = new Int32Array(w);
  const d = img.data;
  const iw = img.width;
  for (let by = 0; by < h; by++) {
    acc.fill(0);
    const yStart = by * k;
    const yEnd = Math.min(img.height, yStart + k);
    for (let y = yStart; y < yEnd; y++) {
      const src = y * iw;
      for (let bx = 0; bx < w; bx++) {
        const xEnd = Math.min(iw, (bx + 1) * k);
        let paper = 0;
        for (let x = bx * k; x < xEnd; x++) paper += d[src + x];
        acc[bx] += (xEnd - bx * k) * 255 - paper;
      }
    }
    const rows = yEnd - yStart;
    for (let bx = 0; bx < w; bx++) out[by * w + bx] = acc[bx] / (rows * (Math.min(iw, (bx + 1) * k) - bx * k) * 255);
  }
  return { width: w, height: h, data: out, factor: k };
}

const blurredCache = new WeakMap<GrayImage, Map<string, InkMap>>();

/**
 * inkMapOf followed by `passes` box blurs of radius r, remembered per raster: a batch registers many pages to the
 * same few blank references, and layout matching registers one page to several references. The unblurred map is
 * remembered too: the coarse level is blurred two ways (profile start and first refinement). Rasters are treated
 * as immutable once made, as everywhere in this code.
 */
export function blurredInkMap(img: GrayImage, factor: number, radius: number, passes: number): InkMap {
  let perImage = blurredCache.get(img);
  if (!perImage) {
    perImage = new Map();
    blurredCache.set(img, perImage);
  }
  const remembered = (key: string, make: () => InkMap): InkMap => {
    let m = perImage.get(key);
    if (!m) {
      m = make();
      perImage.set(key, m);
    }
    return m;
  };
  return remembered(`${factor}/${radius}/${passes}`, () => {
    let m = remembered(`${factor}`, () => inkMapOf(img, factor));
    for (let i = 0; i < passes; i++) m = boxBlur(m, radius);
    return m;
  });
}

/** Separable box blur of radius r (window 2r+1), edges clamped; twice applied it approximates a Gaussian. */
export function boxBlur(m: InkMap, r: number): InkMap {
  if (r <= 0) return m;
  const { width: w, height: h } = m;
  const tmp = new Float32Array(w * h);
  const out = new Float32Array(w * h);
  const win = 2 * r + 1;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    let acc = 0;
    for (let k = -r; k <= r; k++) acc += m.data[row + Math.min(w - 1, Math.max(0, k))];
    for (let x = 0; x < w; x++) {
      tmp[row + x] = acc / win;
      acc += m.data[row + Math.min(w - 1, x + r + 1)] - m.data[row + Math.max(0, x - r)];
    }
  }
  for (let x = 0; x < w; x++) {
    let acc = 0;
    for (let k = -r; k <= r; k++) acc += tmp[Math.min(h - 1, Math.max(0, k)) * w + x];
    for (let y = 0; y < h; y++) {
      out[y * w + x] = acc / win;
      acc += tmp[Math.min(h - 1, y + r + 1) * w + x] - tmp[Math.max(0, y - r) * w + x];
    }
  }
  return { width: w, height: h, data: out, factor: m.factor };
}

/** Central-difference gradients (per map pixel). */
export function gradients(m: InkMap): { gx: Float32Array; gy: Float32Array } {
  const { width: w, height: h, data } = m;
  const gx = new Float32Array(w * h);
  const gy = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const o = y * w + x;
      const l = data[o - (x > 0 ? 1 : 0)];
      const r = data[o + (x < w - 1 ? 1 : 0)];
      const u = data[o - (y > 0 ? w : 0)];
      const dn = data[o + (y < h - 1 ? w : 0)];
      gx[o] = (r - l) / (x > 0 && x < w - 1 ? 2 : 1);
      gy[o] = (dn - u) / (y > 0 && y < h - 1 ? 2 : 1);
    }
  }
  return { gx, gy };
}

/** Row sums (axis 'y') or column sums (axis 'x') of an ink map. */
export function projection(m: InkMap, axis: 'x' | 'y'): Float64Array {
  const out = new Float64Array(axis === 'y' ? m.height : m.width);
  for (let y = 0; y < m.height; y++) {
    for (let x = 0; x < m.width; x++) out[axis === 'y' ? y : x] += m.data[y * m.width + x];
  }
  return out;
}

/** Level transform from a full-resolution one: (ref level -> page level) given factors of each map. */
export function toLevel(fullRefToPage: Affine, refFactor: number, pageFactor: number): Affine {
  const t = fullRefToPage;
  const s = refFactor / pageFactor;
  return { a: t.a * s, b: t.b * s, c: t.c / pageFactor, d: t.d * s, e: t.e * s, f: t.f / pageFactor };
}

/** Full-resolution transform from a level one (inverse of toLevel). */
export function fromLevel(levelRefToPage: Affine, refFactor: number, pageFactor: number): Affine {
  const t = levelRefToPage;
  const s = pageFactor / refFactor;
  return { a: t.a * s, b: t.b * s, c: t.c * pageFactor, d: t.d * s, e: t.e * s, f: t.f * pageFactor };
}
