import type { GrayImage } from './raster.js';

/**
 * Ink versus paper. Otsu's threshold (N. Otsu, "A threshold selection method from gray-level histograms",
 * IEEE Trans. SMC 9(1), 1979) splits the histogram where the between-class variance is largest.
 */
export function otsuThreshold(img: GrayImage): number {
  const hist = new Float64Array(256);
  for (let i = 0; i < img.data.length; i++) hist[img.data[i]]++;
  const total = img.data.length;
  let sumAll = 0;
  for (let v = 0; v < 256; v++) sumAll += v * hist[v];
  let wB = 0;
  let sumB = 0;
  let best = 0;
  let threshold = 128;
  for (let v = 0; v < 256; v++) {
    wB += hist[v];
    if (wB === 0) continue;
    const wF = total - wB;
    if (wF === 0) break;
    sumB += v * hist[v];
    const mB = sumB / wB;
    const mF = (sumAll - sumB) / wF;
    const between = wB * wF * (mB - mF) * (mB - mF);
    if (between > best) {
      best = between;
      threshold = v;
    }
  }
  return threshold;
}

/**
 * Threshold under which a pixel counts as ink: Otsu's, but never above 200 nor below 60, so that a nearly
 * blank page (whose histogram is all paper and noise) does not turn its paper texture into ink (common practice).
 */
export function inkThreshold(img: GrayImage): number {
  return Math.max(60, Math.min(200, otsuThreshold(img)));
}

/** 1 where the pixel is ink (darker than the threshold), else 0. */
export function inkMask(img: GrayImage, threshold = inkThreshold(img)): Uint8Array {
  const m = new Uint8Array(img.data.length);
  for (let i = 0; i < m.length; i++) m[i] = img.data[i] <= threshold ? 1 : 0;
  return m;
}

/** Share of ink pixels, 0..1. */
export function inkShare(img: GrayImage, threshold = inkThreshold(img)): number {
  let n = 0;
  for (let i = 0; i < img.data.length; i++) if (img.data[i] <= threshold) n++;
  return img.data.length ? n / img.data.length : 0;
}
