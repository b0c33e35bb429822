import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { Rng } from './prng.js';
import { rasterizeSvg } from './rasterize.js';
import { gray, n, smoothPath, svgDocument } from '../image/svg.js';

/** How a person marked (or did not mark) a box. `dot` is a stray pen touch: the box still counts as unchecked. */
export const MARK_KINDS = ['empty', 'tick', 'cross', 'fill', 'scribble', 'light', 'dot'] as const;
export type MarkKind = (typeof MARK_KINDS)[number];

/** Marks that mean "checked"; `light` is a faint pencil tick, still a deliberate mark. */
export const CHECKED_MARKS: ReadonlySet<MarkKind> = new Set(['tick', 'cross', 'fill', 'scribble', 'light']);

export function isChecked(mark: MarkKind): boolean {
  return CHECKED_MARKS.has(mark);
}

export type CheckboxShape = 'square' | 'round';

/** The printed, empty box. */
export function checkboxOutlineSvg(box: Box, shape: CheckboxShape, stroke: number, ink = 0): string {
  const s = gray(ink);
  if (shape === 'round') {
    const r = Math.min(box.w, box.h) / 2 - stroke / 2;
    return `<circle cx="${n(box.x + box.w / 2)}" cy="${n(box.y + box.h / 2)}" r="${n(r)}" fill="none" stroke="${s}" stroke-width="${stroke}"/>`;
  }
  const h = stroke / 2;
  return `<rect x="${n(box.x + h)}" y="${n(box.y + h)}" width="${n(box.w - stroke)}" height="${n(box.h - stroke)}" fill="none" stroke="${s}" stroke-width="${stroke}"/>`;
}

/** A hand-made mark inside the box, with the jitter of a real pen. */
export function checkboxMarkSvg(box: Box, shape: CheckboxShape, mark: MarkKind, rng: Rng, ink = 40): string {
  const s = Math.min(box.w, box.h);
  const at = (fx: number, fy: number): [number, number] => [box.x + box.w * (fx + rng.range(-0.05, 0.05)), box.y + box.h * (fy + rng.range(-0.05, 0.05))];
  const width = Math.max(1.5, s * rng.range(0.07, 0.12));
  const pen = (d: string, w: number, level: number) =>
    `<path d="${d}" fill="none" stroke="${gray(level)}" stroke-width="${n(w)}" stroke-linecap="round" stroke-linejoin="round"/>`;
  switch (mark) {
    case 'empty':
      return '';
    case 'tick':
    case 'light': {
      const d = smoothPath([at(0.18, 0.52), at(0.42, 0.8), at(0.62, 0.45), at(0.92, 0.05)]);
      return mark === 'tick' ? pen(d, width, ink) : pen(d, Math.max(1.2, width * 0.6), rng.range(140, 185));
    }
    case 'cross': {
      const a = smoothPath([at(0.15, 0.15), at(0.5, 0.52), at(0.86, 0.86)]);
      const b = smoothPath([at(0.86, 0.14), at(0.5, 0.5), at(0.14, 0.86)]);
      return pen(a, width, ink) + pen(b, width, ink);
    }
    case 'fill': {
      const i = s * rng.range(0.12, 0.2);
      if (shape === 'round') {
        return `<circle cx="${n(box.x + box.w / 2)}" cy="${n(box.y + box.h / 2)}" r="${n(s / 2 - i)}" fill="${gray(ink)}"/>`;
      }
      return `<rect x="${n(box.x + i)}" y="${n(box.y + i)}" width="${n(box.w - 2 * i)}" height="${n(box.h - 2 * i)}" fill="${gray(ink)}"/>`;
    }
    case 'scribble': {
      const pts: [number, number][] = [];
      const rows = rng.int(4, 7);
      for (let k = 0; k <= rows; k++) pts.push(at(k % 2 === 0 ? 0.18 : 0.82, 0.15 + (0.7 * k) / rows));
      return pen(smoothPath(pts), width, ink);
    }
    case 'dot': {
      const [cx, cy] = at(rng.range(0.25, 0.75), rng.range(0.25, 0.75));
      return `<circle cx="${n(cx)}" cy="${n(cy)}" r="${n(Math.max(1, s * 0.05))}" fill="${gray(ink)}"/>`;
    }
  }
}

export interface CheckboxDrawing {
  /** Side of the printed box in pixels. */
  size: number;
  shape: CheckboxShape;
  mark: MarkKind;
  seed: number;
  stroke?: number;
  /** White margin around the box. */
  padding?: number;
}

/**
 * A single checkbox on white paper as a grayscale raster: the same drawing the page renderer uses, so that fill-ratio
 * readers can be tested on real pixels of every mark kind.
 */
export async function renderCheckbox(d: CheckboxDrawing): Promise<{ image: GrayImage; box: Box }> {
  const pad = d.padding ?? Math.round(d.size / 2);
  const side = d.size + 2 * pad;
  const box = { x: pad, y: pad, w: d.size, h: d.size };
  const stroke = d.stroke ?? Math.max(2, Math.round(d.size / 14));
  const body = checkboxOutlineSvg(box, d.shape, stroke) + checkboxMarkSvg(box, d.shape, d.mark, new Rng(d.seed));
  return { image: await rasterizeSvg(svgDocument(side, side, body)), box };
}
