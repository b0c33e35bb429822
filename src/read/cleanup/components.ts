import type { Box } from '../../page/geometry.js';
import type { GrayImage } from '../../page/raster.js';
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

/** 8-connected component labeling of the ink pixels (breadth-first flood fill; common practice). */
export function labelComponents(img: GrayImage): Labeling {
  const { width: w, height: h, data } = img;
  const labels = new Int32Array(w * h);
  const components: Component[] = [];
  const queue = new Int32Array(w * h);
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
      if (px < x0) x0 = px;
      if (px > x1) x1 = px;
      if (py < y0) y0 = py;
      if (py > y1) y1 = py;
      for (let dy = -1; dy <= 1; dy++) {
        const ny = py + dy;
        if (ny < 0 || ny >= h) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const nx = px + dx;
          if (nx < 0 || nx >= w) continue;
          const q = ny * w + nx;
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

export interface ComponentFilterOptions {
  /**
   * Scale of the writing in pixels, usually the field box's height: the size limits below are shares of it.
   */
  scale: number;
  /** Drop components that touch the crop border (border and comb fragments at the edges). Default true. */
  dropBorder?: boolean;
  /** Smallest ink area kept, as a share of scale^2. Default 0.004 (a 40 px cell keeps 7 px and up: periods, i-dots). */
  minArea?: number;
  /** Drop slivers: at most this many pixels thick and longer than `scale` (rule remnants). Default 2. */
  maxSliverThickness?: number;
  /** Field box in crop pixels: components lying entirely outside it are dropped (printed labels beside the cell). */
  inside?: Box;
}

/** Keep only components that can be characters; returns the cleaned image and the kept components. */
export function filterComponents(
  img: GrayImage,
  options: ComponentFilterOptions,
): { image: GrayImage; kept: Component[]; dropped: number } {
  const { labels, components } = labelComponents(img);
  const s = Math.max(1, options.scale);
  const minArea = Math.max(2, (options.minArea ?? 0.004) * s * s);
  const sliver = options.maxSliverThickness ?? 2;
  const inside = options.inside;
  const keep = new Uint8Array(components.length + 1);
  const kept: Component[] = [];
  for (const c of components) {
    const b = c.box;
    let ok = c.area >= minArea;
    if (ok && (options.dropBorder ?? true) && c.touchesBorder) ok = false;
    if (ok && Math.min(b.w, b.h) <= sliver && Math.max(b.w, b.h) > s) ok = false;
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
