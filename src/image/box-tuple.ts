import type { Box } from './geometry.js';

/** Box as the [x, y, w, h] tuple that COCO, truth and schema files use. */
export const boxTuple = (b: Box): [number, number, number, number] => [b.x, b.y, b.w, b.h];
