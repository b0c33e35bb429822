import type { Box } from '../image/geometry.js';
import { clampBox, roundBox } from '../image/geometry.js';

/** 3x3 projective transform, row-major: [x', y', w'] = H [x, y, 1]; points are (x'/w', y'/w'). */
export type Homography = readonly [number, number, number, number, number, number, number, number, number];

export const IDENTITY_H: Homography = [1, 0, 0, 0, 1, 0, 0, 0, 1];

export function multiplyH(a: Homography, b: Homography): Homography {
  const out: number[] = [];
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out.push(a[r * 3] * b[c] + a[r * 3 + 1] * b[3 + c] + a[r * 3 + 2] * b[6 + c]);
  return out as unknown as Homography;
}

/** Compose left to right: composeH(a, b, c) applies a, then b, then c. */
export function composeH(...steps: Homography[]): Homography {
  return steps.reduce((acc, h) => multiplyH(h, acc), IDENTITY_H);
}

export function invertH(h: Homography): Homography {
  const [a, b, c, d, e, f, g, k, i] = h;
  const A = e * i - f * k;
  const B = -(d * i - f * g);
  const C = d * k - e * g;
  const det = a * A + b * B + c * C;
  if (Math.abs(det) < 1e-15) throw new Error('homography is not invertible');
  const inv = [A, -(b * i - c * k), b * f - c * e, B, a * i - c * g, -(a * f - c * d), C, -(a * k - b * g), a * e - b * d];
  return inv.map((v) => v / det) as unknown as Homography;
}

export function applyH(h: Homography, x: number, y: number): [number, number] {
  const w = h[6] * x + h[7] * y + h[8];
  return [(h[0] * x + h[1] * y + h[2]) / w, (h[3] * x + h[4] * y + h[5]) / w];
}

export const translateH = (tx: number, ty: number): Homography => [1, 0, tx, 0, 1, ty, 0, 0, 1];
export const scaleH = (sx: number, sy = sx): Homography => [sx, 0, 0, 0, sy, 0, 0, 0, 1];

/** Rotation by `deg` degrees; positive turns the content clockwise as seen on screen (image y axis points down). */
export function rotateH(deg: number): Homography {
  const t = (deg * Math.PI) / 180;
  const c = Math.cos(t);
  const s = Math.sin(t);
  return [c, -s, 0, s, c, 0, 0, 0, 1];
}

/** Axis-aligned bounds of a box's four corners after the transform (how labels follow a warped page). */
export function transformBoxH(h: Homography, b: Box): Box {
  const pts = [applyH(h, b.x, b.y), applyH(h, b.x + b.w, b.y), applyH(h, b.x, b.y + b.h), applyH(h, b.x + b.w, b.y + b.h)];
  const xs = pts.map((p) => p[0]);
  const ys = pts.map((p) => p[1]);
  const x = Math.min(...xs);
  const y = Math.min(...ys);
  return { x, y, w: Math.max(...xs) - x, h: Math.max(...ys) - y };
}

/** A reference-page box as it lies on the scan: corners transformed, axis-aligned bounds, rounded outward to whole
 *  pixels, clamped to the page. */
export function scanBox(h: Homography, b: Box, width: number, height: number): Box {
  return clampBox(roundBox(transformBoxH(h, b)), width, height);
}
