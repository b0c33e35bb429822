import type { GrayImage } from './raster.js';
import { createGray } from './raster.js';
import { thresholdAt } from './binary.js';

/** 256-bin histogram of a grayscale image. */
export function histogram(img: GrayImage): Float64Array {
  // Four integer tallies taken in turn: a page is mostly one paper level, and one tally would wait on its own
  // previous increment at every pixel. Whole-number counts, so the result is the same as one float tally's.
  const c0 = new Int32Array(256);
  const c1 = new Int32Array(256);
  const c2 = new Int32Array(256);
  const c3 = new Int32Array(256);
  const d = img.data;
  const n = d.length;
  let i = 0;
  for (; i + 3 < n; i += 4) {
    c0[d[i]]++;
    c1[d[i + 1]]++;
    c2[d[i + 2]]++;
    c3[d[i + 3]]++;
  }
  for (; i < n; i++) c0[d[i]]++;
  const h = new Float64Array(256);
  for (let v = 0; v < 256; v++) h[v] = c0[v] + c1[v] + c2[v] + c3[v];
  return h;
}

/**
 * Otsu's threshold (N. Otsu, "A threshold selection method from gray-level histograms", IEEE Trans. SMC 9(1), 1979):
 * the level t that maximizes the between-class variance  sigma_B^2(t) = [mu_T * omega(t) - mu(t)]^2 / (omega(t) (1 - omega(t))),
 * with omega(t) the share of pixels <= t and mu(t) their first moment. Pixels <= t form the dark class (ink).
 * On a plateau of equal variance (an empty gap between two modes) the first level is taken.
 * Returns -1 when the histogram holds fewer than two distinct levels (no split exists).
 */
export function otsuThreshold(hist: ArrayLike<number>): number {
  let total = 0;
  let sumAll = 0;
  for (let i = 0; i < 256; i++) {
    total += hist[i] ?? 0;
    sumAll += i * (hist[i] ?? 0);
  }
  if (total === 0) return -1;
  const muT = sumAll / total;
  let omega = 0;
  let mu = 0;
  let best = -1;
  let bestVar = 0;
  for (let t = 0; t < 255; t++) {
    const p = (hist[t] ?? 0) / total;
    omega += p;
    mu += t * p;
    if (omega <= 0 || omega >= 1) continue;
    const between = (muT * omega - mu) ** 2 / (omega * (1 - omega));
    // Relative tolerance so floating-point noise on a plateau does not move the choice.
    if (between > bestVar * (1 + 1e-12)) {
      bestVar = between;
      best = t;
    }
  }
  return best;
}

/** Mean gray level of the pixels at or below t and above t. */
function classMeans(hist: Float64Array, t: number): [number, number] {
  let n0 = 0, s0 = 0, n1 = 0, s1 = 0;
  for (let i = 0; i < 256; i++) {
    if (i <= t) { n0 += hist[i]; s0 += i * hist[i]; } else { n1 += hist[i]; s1 += i * hist[i]; }
  }
  return [n0 ? s0 / n0 : 0, n1 ? s1 / n1 : 255];
}

/**
 * Global Otsu binarization. A crop whose two classes differ by less than `minContrast` gray levels holds no ink
 * worth splitting (a blank cell, paper grain): it becomes all paper. 48 levels is common practice for scans
 * (ink on white paper differs by well over 100 levels), not measured.
 * Ink covers a small share of a field crop; when the dark class holds more than `maxInkShare` of the pixels, Otsu
 * has split paper from a tinted cell or a shadow, so the split is repeated inside the dark class (recursive Otsu,
 * as in multi-level thresholding; the 40 % share is common practice).
 */
export function binarizeOtsu(img: GrayImage, minContrast = 48, maxInkShare = 0.4): GrayImage {
  const hist = histogram(img);
  let t = otsuThreshold(hist);
  if (t < 0) return createGray(img.width, img.height, img.data[0] > 127 ? 255 : 0);
  for (let round = 0; round < 2; round++) {
    let dark = 0;
    for (let i = 0; i <= t; i++) dark += hist[i];
    if (dark <= maxInkShare * img.data.length) break;
    const sub = hist.slice();
    sub.fill(0, t + 1);
    const t2 = otsuThreshold(sub);
    if (t2 < 0) break;
    const [d, l] = classMeans(sub, t2);
    if (l - d < minContrast) break;
    t = t2;
  }
  const [dark, light] = classMeans(hist, t);
  if (light - dark < minContrast) return createGray(img.width, img.height, 255);
  return thresholdAt(img, t);
}
