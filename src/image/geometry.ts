/** Axis-aligned box in pixels: left, top, width, height. */
export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

export type Point = readonly [number, number];

export function area(b: Box): number {
  return Math.max(0, b.w) * Math.max(0, b.h);
}

/** Intersection over union of two boxes (continuous pixel convention: a box covers [x, x+w)). */
export function iou(a: Box, b: Box): number {
  const ix = Math.max(0, Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x));
  const iy = Math.max(0, Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y));
  const inter = ix * iy;
  const union = area(a) + area(b) - inter;
  return union > 0 ? inter / union : 0;
}

export function center(b: Box): Point {
  return [b.x + b.w / 2, b.y + b.h / 2];
}

/** Clamp a box to [0, width) x [0, height); may return an empty box. */
export function clampBox(b: Box, width: number, height: number): Box {
  const x0 = Math.max(0, Math.min(width, b.x));
  const y0 = Math.max(0, Math.min(height, b.y));
  const x1 = Math.max(0, Math.min(width, b.x + b.w));
  const y1 = Math.max(0, Math.min(height, b.y + b.h));
  return { x: x0, y: y0, w: Math.max(0, x1 - x0), h: Math.max(0, y1 - y0) };
}

/** Smallest box holding all the boxes (a choice group's area, a field of several parts); needs at least one box. */
export function unionBox(boxes: readonly Box[]): Box {
  const x = Math.min(...boxes.map((b) => b.x));
  const y = Math.min(...boxes.map((b) => b.y));
  return { x, y, w: Math.max(...boxes.map((b) => b.x + b.w)) - x, h: Math.max(...boxes.map((b) => b.y + b.h)) - y };
}

/** Round outward to integer pixels. */
export function roundBox(b: Box): Box {
  const x0 = Math.floor(b.x);
  const y0 = Math.floor(b.y);
  return { x: x0, y: y0, w: Math.ceil(b.x + b.w) - x0, h: Math.ceil(b.y + b.h) - y0 };
}

/**
 * 2-D affine transform  [x', y'] = [a*x + b*y + c, d*x + e*y + f].
 * A similarity transform is the special case a = e = s*cos t, d = -b = s*sin t.
 */
export interface Affine {
  a: number;
  b: number;
  c: number;
  d: number;
  e: number;
  f: number;
}

export const IDENTITY: Affine = { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 };

export function applyAffine(t: Affine, p: Point): Point {
  return [t.a * p[0] + t.b * p[1] + t.c, t.d * p[0] + t.e * p[1] + t.f];
}

export function invertAffine(t: Affine): Affine {
  const det = t.a * t.e - t.b * t.d;
  if (Math.abs(det) < 1e-12) throw new Error('affine transform is not invertible');
  const a = t.e / det;
  const b = -t.b / det;
  const d = -t.d / det;
  const e = t.a / det;
  return { a, b, c: -(a * t.c + b * t.f), d, e, f: -(d * t.c + e * t.f) };
}

/** t2 after t1. */
export function composeAffine(t2: Affine, t1: Affine): Affine {
  return {
    a: t2.a * t1.a + t2.b * t1.d,
    b: t2.a * t1.b + t2.b * t1.e,
    c: t2.a * t1.c + t2.b * t1.f + t2.c,
    d: t2.d * t1.a + t2.e * t1.d,
    e: t2.d * t1.b + t2.e * t1.e,
    f: t2.d * t1.c + t2.e * t1.f + t2.f,
  };
}

/** Bounding box of a box's four corners after a transform. */
export function transformBox(t: Affine, b: Box): Box {
  const pts = [
    applyAffine(t, [b.x, b.y]),
    applyAffine(t, [b.x + b.w, b.y]),
    applyAffine(t, [b.x, b.y + b.h]),
    applyAffine(t, [b.x + b.w, b.y + b.h]),
  ];
  const xs = pts.map((p) => p[0]);
  const ys = pts.map((p) => p[1]);
  const x = Math.min(...xs);
  const y = Math.min(...ys);
  return { x, y, w: Math.max(...xs) - x, h: Math.max(...ys) - y };
}
