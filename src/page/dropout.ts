import type { Affine } from './geometry.js';
import { invertAffine } from './geometry.js';
import type { GrayImage } from './raster.js';

/**
 * Form dropout: once the page is aligned to its blank reference, every page pixel that falls on (or right next
 * to) printed ink of the blank — labels, rules, comb boxes — is turned to paper, so only what was filled in
 * remains. The reference ink is dilated first to absorb the last pixel or two of misregistration and the blur
 * of the scan; this is the digital form of "drop-out ink" forms printed in a colour the scanner does not see.
 */

export interface DropoutOptions {
  /**
   * Dilation radius in reference pixels (default 2: about 0.25 mm at 200 dpi, the residual of image
   * registration plus a pixel of blur; measured on bench/dropout-gain.ts).
   */
  dilate?: number;
  /**
   * Reference pixels at or below this gray count as printed ink (default 200: anti-aliased edges of thin
   * rules are mid-gray and must go too; common practice).
   */
  referenceThreshold?: number;
}

export interface Dropout {
  /** The page with the printed form removed, same size as the page. */
  image: GrayImage;
  /** Share of the page's pixels that were under the (dilated) form mask. */
  masked: number;
}

/** Mask of the reference's printed ink, dilated by a (2r+1)-square (separable max filter). */
export function formMask(reference: GrayImage, radius: number, threshold: number): Uint8Array {
  const { width: w, height: h, data } = reference;
  const ink = new Uint8Array(w * h);
  for (let i = 0; i < ink.length; i++) ink[i] = data[i] <= threshold ? 1 : 0;
  if (radius <= 0) return ink;
  const rows = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) {
    const o = y * w;
    let last = -Infinity;
    // Distance to the nearest ink to the left, then a right-to-left pass for the right side.
    for (let x = 0; x < w; x++) {
      if (ink[o + x]) last = x;
      if (x - last <= radius) rows[o + x] = 1;
    }
    last = Infinity;
    for (let x = w - 1; x >= 0; x--) {
      if (ink[o + x]) last = x;
      if (last - x <= radius) rows[o + x] = 1;
    }
  }
  const out = new Uint8Array(w * h);
  for (let x = 0; x < w; x++) {
    let last = -Infinity;
    for (let y = 0; y < h; y++) {
      if (rows[y * w + x]) last = y;
      if (y - last <= radius) out[y * w + x] = 1;
    }
    last = Infinity;
    for (let y = h - 1; y >= 0; y--) {
      if (rows[y * w + x]) last = y;
      if (last - y <= radius) out[y * w + x] = 1;
    }
  }
  return out;
}

/**
 * Paper tone per 32-px block: the 90th percentile of its grays, then the brightest within two blocks (ink rarely covers more than a tenth of a block;
 * common practice for background estimation). Removed pixels take this tone, so that dropout leaves no bright
 * ghost rules on gray or unevenly lit paper for a binarizer to trip on.
 */
function paperTone(page: GrayImage, block: number): { tone: Uint8Array; cols: number } {
  const cols = Math.ceil(page.width / block);
  const rows = Math.ceil(page.height / block);
  const tone = new Uint8Array(cols * rows);
  const hist = new Uint32Array(256);
  for (let by = 0; by < rows; by++) {
    for (let bx = 0; bx < cols; bx++) {
      hist.fill(0);
      let n = 0;
      for (let y = by * block; y < Math.min(page.height, (by + 1) * block); y++) {
        for (let x = bx * block; x < Math.min(page.width, (bx + 1) * block); x++) {
          hist[page.data[y * page.width + x]]++;
          n++;
        }
      }
      let acc = 0;
      let v = 0;
      while (v < 255 && acc + hist[v] <= 0.9 * n) acc += hist[v++];
      tone[by * cols + bx] = v;
    }
  }
  // A block filled by a bold logo has no paper of its own: take the brightest tone within two blocks.
  let cur = tone;
  for (let pass = 0; pass < 2; pass++) {
    const next = new Uint8Array(cur.length);
    for (let by = 0; by < rows; by++) {
      for (let bx = 0; bx < cols; bx++) {
        let m = 0;
        for (let dy = -1; dy <= 1; dy++) {
          for (let dx = -1; dx <= 1; dx++) {
            const yy = by + dy;
            const xx = bx + dx;
            if (yy >= 0 && xx >= 0 && yy < rows && xx < cols) m = Math.max(m, cur[yy * cols + xx]);
          }
        }
        next[by * cols + bx] = m;
      }
    }
    cur = next;
  }
  return { tone: cur, cols };
}

/**
 * Remove the printed form from an aligned page. `refToPage` maps reference coordinates to page coordinates
 * (Alignment.refToPage). Pure.
 */
export function dropoutForm(page: GrayImage, reference: GrayImage, refToPage: Affine, options: DropoutOptions = {}): Dropout {
  const mask = formMask(reference, options.dilate ?? 2, options.referenceThreshold ?? 200);
  const t = invertAffine(refToPage);
  const out = new Uint8Array(page.data);
  const rw = reference.width;
  const rh = reference.height;
  const block = 32;
  const paper = paperTone(page, block);
  let masked = 0;
  for (let y = 0; y < page.height; y++) {
    const yc = y + 0.5;
    let rx = t.a * 0.5 + t.b * yc + t.c;
    let ry = t.d * 0.5 + t.e * yc + t.f;
    let o = y * page.width;
    for (let x = 0; x < page.width; x++, o++, rx += t.a, ry += t.d) {
      const ix = Math.floor(rx);
      const iy = Math.floor(ry);
      if (ix < 0 || iy < 0 || ix >= rw || iy >= rh) continue;
      if (mask[iy * rw + ix]) {
        out[o] = paper.tone[Math.floor(y / block) * paper.cols + Math.floor(x / block)];
        masked++;
      }
    }
  }
  return { image: { width: page.width, height: page.height, data: out }, masked: masked / Math.max(1, out.length) };
}
