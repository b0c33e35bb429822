import type { Box } from '../../image/geometry.js';
import type { GrayImage } from '../../image/raster.js';
import { createGray } from '../../image/raster.js';
import { INK } from '../../image/binary.js';

/**
 * Skew angle of the text in a binary crop, degrees, positive when lines fall to the right (clockwise in image
 * coordinates). Projection-profile method (Postl 1986; Baird 1987): shear the ink by each candidate angle and keep
 * the one whose row histogram is sharpest (largest sum of squares). Searches +-maxDegrees in `step` increments.
 */
export function estimateCropSkew(img: GrayImage, maxDegrees = 5, step = 0.25): number {
  const xs: number[] = [], ys: number[] = [];
  for (let y = 0; y < img.height; y++)
    for (let x = 0; x < img.width; x++) if (img.data[y * img.width + x] === INK) { xs.push(x); ys.push(y); }
  if (xs.length < 20) return 0;
  const pad = Math.ceil(img.width * Math.tan((maxDegrees * Math.PI) / 180)) + 1;
  const bins = new Float64Array(img.height + 2 * pad);
  const scores: [number, number][] = [];
  for (let deg = -maxDegrees; deg <= maxDegrees + 1e-9; deg += step) {
    const t = Math.tan((deg * Math.PI) / 180);
    bins.fill(0);
    for (let i = 0; i < xs.length; i++) bins[Math.round(ys[i] - xs[i] * t) + pad]++;
    let score = 0;
    for (let i = 0; i < bins.length; i++) score += bins[i] * bins[i];
    scores.push([deg, score]);
  }
  const top = Math.max(...scores.map((s) => s[1]));
  // Among equally sharp angles take the smallest, so a straight crop stays untouched.
  let best = Infinity;
  for (const [deg, score] of scores) if (score >= top * (1 - 1e-9) && Math.abs(deg) < Math.abs(best)) best = deg;
  return Math.round(best * 100) / 100;
}

/**
 * Rotate a crop by `degrees` about its centre, keeping its size (uncovered corners become paper), bilinear.
 * Positive = counter-clockwise on screen, which undoes a positive skew from estimateCropSkew. Not to be confused
 * with image/warp.ts rotateGray, the page-level turn: clockwise for positive angles, canvas grown to hold the page,
 * and the transform returned.
 */
export function rotateCrop(img: GrayImage, degrees: number): GrayImage {
  if (degrees === 0) return img;
  const a = (degrees * Math.PI) / 180;
  const cos = Math.cos(a), sin = Math.sin(a);
  const cx = (img.width - 1) / 2, cy = (img.height - 1) / 2;
  const out = createGray(img.width, img.height);
  for (let y = 0; y < img.height; y++) {
    for (let x = 0; x < img.width; x++) {
      // Inverse mapping: the source pixel that lands on (x, y).
      const dx = x - cx, dy = y - cy;
      const sx = cos * dx - sin * dy + cx;
      const sy = sin * dx + cos * dy + cy;
      const x0 = Math.floor(sx), y0 = Math.floor(sy);
      if (x0 < -1 || y0 < -1 || x0 >= img.width || y0 >= img.height) continue;
      const tx = sx - x0, ty = sy - y0;
      const px = (xx: number, yy: number) =>
        xx < 0 || yy < 0 || xx >= img.width || yy >= img.height ? 255 : img.data[yy * img.width + xx];
      const v = (px(x0, y0) * (1 - tx) + px(x0 + 1, y0) * tx) * (1 - ty) + (px(x0, y0 + 1) * (1 - tx) + px(x0 + 1, y0 + 1) * tx) * ty;
      out.data[y * img.width + x] = Math.round(v);
    }
  }
  return out;
}

/**
 * Where a field box lands after rotateCrop(img, degrees), and how large the upright field inside it is. A box found
 * on a tilted page is the axis-aligned bound of a tilted rectangle of w x h:  W = w cos t + h sin t,
 * H = w sin t + h cos t; solving for w and h gives the upright rectangle, centred where the box's centre moves.
 * The tighter box keeps a neighbouring label, which the tilt brought into the bound, out of the field.
 */
export function uprightBox(box: Box, degrees: number, width: number, height: number): Box {
  const t = (Math.abs(degrees) * Math.PI) / 180;
  const c = Math.cos(t), s = Math.sin(t);
  const det = c * c - s * s;
  let w = (box.w * c - box.h * s) / det;
  let h = (box.h * c - box.w * s) / det;
  // A long thin box tilted further than its own aspect allows: keep the bound rather than invent a size.
  if (!(w > 0 && h > 0)) { w = box.w; h = box.h; }
  const a = (degrees * Math.PI) / 180;
  const cx = (width - 1) / 2, cy = (height - 1) / 2;
  const dx = box.x + box.w / 2 - cx, dy = box.y + box.h / 2 - cy;
  const nx = Math.cos(a) * dx + Math.sin(a) * dy + cx;
  const ny = -Math.sin(a) * dx + Math.cos(a) * dy + cy;
  return { x: nx - w / 2, y: ny - h / 2, w, h };
}
