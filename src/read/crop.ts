import type { Box } from '../image/geometry.js';
import { clampBox, roundBox } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropGray } from '../image/raster.js';

/** Padding around a located area: pixels, or "N%" of the box's shorter side (the schema's `padding`). */
export type Padding = number | `${number}%` | string;

/** A crop taken from the full-resolution page, with where it came from and where the field sits inside it. */
export interface FieldCrop {
  image: GrayImage;
  /** The crop's rectangle in page pixels (integer, clamped to the page). */
  pageBox: Box;
  /** The located field's box in crop pixels (before padding; may reach outside the crop when clamped). */
  inner: Box;
}

/** Padding in pixels for a box: a number is pixels; "N%" is N percent of the box's shorter side. */
export function paddingPixels(box: Box, padding: Padding): number {
  if (typeof padding === 'number') {
    if (!Number.isFinite(padding) || padding < 0) throw new Error(`Expected padding >= 0 pixels but received ${padding}`);
    return padding;
  }
  const m = /^(\d+(?:\.\d+)?)%$/.exec(padding.trim());
  if (!m) throw new Error(`Expected padding as pixels or "N%" but received "${padding}"`);
  return (Number(m[1]) / 100) * Math.min(box.w, box.h);
}

/** Grow a box by `pad` pixels on every side, round outward and clamp to the page. */
export function paddedBox(box: Box, pad: number, width: number, height: number): Box {
  const grown = { x: box.x - pad, y: box.y - pad, w: box.w + 2 * pad, h: box.h + 2 * pad };
  return clampBox(roundBox(grown), width, height);
}

/** Crop a located field from the full-resolution page with padding, clamped to the page. */
export function cropField(page: GrayImage, box: Box, padding: Padding = 0): FieldCrop {
  const pageBox = paddedBox(box, paddingPixels(box, padding), page.width, page.height);
  if (pageBox.w <= 0 || pageBox.h <= 0) {
    throw new Error(`field box [${box.x}, ${box.y}, ${box.w}, ${box.h}] lies outside the ${page.width}x${page.height} page`);
  }
  return {
    image: cropGray(page, pageBox),
    pageBox,
    inner: { x: box.x - pageBox.x, y: box.y - pageBox.y, w: box.w, h: box.h },
  };
}

/**
 * The field with its surroundings, for a person in the review queue: the box grown by `context` times its own
 * height on every side (so the printed label beside or above the cell is visible), at least `minMargin` pixels.
 * One box-height of context shows a label printed on the line above; the numbers are common practice, not measured.
 */
export function contextCrop(
  page: GrayImage,
  box: Box,
  options: { context?: number; minMargin?: number } = {},
): FieldCrop {
  const margin = Math.max(options.minMargin ?? 24, (options.context ?? 1) * box.h);
  return cropField(page, box, margin);
}
