import type { Box } from './geometry.js';
import type { GrayImage } from './raster.js';
import { INK, PAPER } from './binary.js';

export interface Component {
  /** Label in the label image (1-based). */
  id: number;
  box: Box;
  /** Ink pixels. */
  area: number;
  touchesBorder: boolean;
}

export interface Labeling {
  /** Per pixel: 0 paper, otherwise the component id. */
  labels: Int32Array;
  components: Component[];
}

/** Breadth-first queue shared by every labeling in this thread (labelComponents is synchronous), grown as needed. */
let scratch = new Int32Array(0);

/** 8-connected component labeling of the ink pixels (breadth-first flood fill; common practice). */
export function labelComponents(img: GrayImage): Labeling {
  const { width: w, height: h, data } = img;
  const labels = new Int32Array(w * h);
  const components: Component[] = [];
  if (scratch.length < w * h) scratch = new Int32Array(w * h);
  const queue = scratch;
  for (let start = 0; start < w * h; start++) {
    if (data[start] !== INK || labels[start] !== 0) continue;
    const id = components.length + 1;
    let head = 0, tail = 0;
    queue[tail++] = start;
    labels[start] = id;
    let x0 = w, y0 = h, x1 = -1, y1 = -1;
    while (head < tail) {
      const p = queue[head++];
      const px = p % w, py = (p - px) / w;
      let q: number;
      if (px < x0) x0 = px;
      if (px > x1) x1 = px;
      if (py < y0) y0 = py;
      if (py > y1) y1 = py;
      if (px > 0 && py > 0 && px < w - 1 && py < h - 1) {
        // Inside the border every neighbour exists: no bounds tests (most ink pixels of a page or crop).
        q = p - w - 1;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p - w;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p - w + 1;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p - 1;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p + 1;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p + w - 1;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p + w;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        q = p + w + 1;
        if (data[q] === INK && labels[q] === 0) {
          labels[q] = id;
          queue[tail++] = q;
        }
        continue;
      }
      for (let dy = -1; dy <= 1; dy++) {
        const ny = py + dy;
        if (ny < 0 || ny >= h) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const nx = px + dx;
          if (nx < 0 || nx >= w) continue;
          q = ny * w + nx;
          if (data[q] === INK && labels[q] === 0) {
            labels[q] = id;
            queue[tail++] = q;
          }
        }
      }
    }
    components.push({
      id,
      box: { x: x0, y: y0, w: x1 - x0 + 1, h: y1 - y0 + 1 },
      area: tail,
      touchesBorder: x0 === 0 || y0 === 0 || x1 === w - 1 || y1 === h - 1,
    });
  }
  return { labels, components };
}

/**
 * Typical character height among components: the median height of those that could be glyphs (at least 3 px tall,
 * not touching the border, not a long flat or tall thin stroke). For mixed-case text it is near the x-height, for
 * digits and capitals the cap height. Null when no candidate exists.
 */
export function typicalHeight(components: Component[]): number | null {
  const hs = components
    .filter((c) => c.box.h >= 3 && !c.touchesBorder && c.box.w <= 6 * c.box.h && c.box.h <= 8 * c.box.w)
    .map((c) => c.box.h)
    .sort((a, b) => a - b);
  return hs.length ? hs[Math.floor(hs.length / 2)] : null;
}

export interface ComponentFilterOptions {
  /** Character height in pixels; estimated from the components (typicalHeight) when absent. */
  characterHeight?: number;
  /** Drop components that touch the crop border (border and comb fragments at the edges). Default true. */
  dropBorder?: boolean;
  /** Field box in crop pixels: components lying entirely outside it are dropped (printed labels beside the cell). */
  inside?: Box;
}

/**
 * Is a component a straight stroke? The centre of its ink in each row is fitted with a line x = a y + b (least
 * squares); a ruled line, upright or slightly tilted, stays within 1 px of it (RMS), a handwritten stroke wanders.
 */
export function isStraight(labels: Int32Array, width: number, c: Component): boolean {
  const ys: number[] = [], xs: number[] = [];
  for (let y = c.box.y; y < c.box.y + c.box.h; y++) {
    let sum = 0, n = 0;
    for (let x = c.box.x; x < c.box.x + c.box.w; x++) if (labels[y * width + x] === c.id) { sum += x; n++; }
    if (n) { ys.push(y); xs.push(sum / n); }
  }
  const n = ys.length;
  if (n < 3) return true;
  const my = ys.reduce((a, v) => a + v, 0) / n, mx = xs.reduce((a, v) => a + v, 0) / n;
  let syy = 0, sxy = 0;
  for (let i = 0; i < n; i++) { syy += (ys[i] - my) ** 2; sxy += (ys[i] - my) * (xs[i] - mx); }
  const a = syy > 0 ? sxy / syy : 0;
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (xs[i] - (mx + a * (ys[i] - my))) ** 2;
  return Math.sqrt(sse / n) <= 1;
}

/**
 * Keep only components that can be characters. Limits are shares of the character height h (common practice for
 * printed text; the shares were checked on bench/cleanup-gain.ts): specks under (0.12 h)^2 pixels (a period or
 * i-dot of the same text is about (0.25 h)^2); slivers thinner than 0.15 h and longer than 2.5 h (rule remnants);
 * straight thin uprights (at most 0.3 h wide) taller than 1.7 h, or at most 0.5 h wide and taller than 2.5 h
 * (box sides, also slightly tilted ones: a printed "l" or "1" reaches about 1.45 x-height; a handwritten "l" or "S"
 * may be taller but is not straight);
 * sparse shapes taller than 2 h that fill under a quarter of their bounds (box corners left by rule removal).
 */
export function filterComponents(
  img: GrayImage,
  options: ComponentFilterOptions = {},
): { image: GrayImage; kept: Component[]; dropped: number } {
  const { labels, components } = labelComponents(img);
  const h = options.characterHeight ?? typicalHeight(components) ?? 0;
  const minArea = Math.max(3, (0.12 * h) ** 2);
  const thin = Math.max(2, 0.15 * h);
  const inside = options.inside;
  const keep = new Uint8Array(components.length + 1);
  const kept: Component[] = [];
  for (const c of components) {
    const b = c.box;
    let ok = c.area >= minArea;
    if (ok && (options.dropBorder ?? true) && c.touchesBorder) ok = false;
    if (ok && h > 0 && Math.min(b.w, b.h) <= thin && Math.max(b.w, b.h) > 2.5 * h) ok = false;
    const upright = (b.w <= Math.max(3, 0.3 * h) && b.h > 1.7 * h) || (b.w <= 0.5 * h && b.h > 2.5 * h);
    if (ok && h > 0 && upright && isStraight(labels, img.width, c)) ok = false;
    if (ok && h > 0 && b.h > 2 * h && c.area < 0.25 * b.w * b.h) ok = false;
    if (ok && inside) {
      const outside = b.x + b.w <= inside.x || b.x >= inside.x + inside.w || b.y + b.h <= inside.y || b.y >= inside.y + inside.h;
      if (outside) ok = false;
    }
    if (ok) {
      keep[c.id] = 1;
      kept.push(c);
    }
  }
  const out = { width: img.width, height: img.height, data: new Uint8Array(img.data.length).fill(PAPER) };
  for (let i = 0; i < labels.length; i++) if (keep[labels[i]]) out.data[i] = INK;
  return { image: out, kept, dropped: components.length - kept.length };
}
