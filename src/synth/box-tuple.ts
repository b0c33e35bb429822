import type { Box } from '../image/geometry.js';

/** Box as the [x, y, w, h] tuple that COCO, truth and schema files use. */
export const boxTuple = (b: Box): [number, number, number, number] => [b.x, b.y, b.w, b.h];

/** Smallest box holding all the boxes (a choice group's area). */
export function unionBox(boxes: readonly Box[]): Box {
  const x = Math.min(...boxes.map((b) => b.x));
  const y = Math.min(...boxes.map((b) => b.y));
  return { x, y, w: Math.max(...boxes.map((b) => b.x + b.w)) - x, h: Math.max(...boxes.map((b) => b.y + b.h)) - y };
}
