import type { Box } from '../image/geometry.js';
import { center, iou } from '../image/geometry.js';

/**
 * How well a detection stands for an expected (aligned) region, 0..1.
 * IoU, but a detection that contains the region's centre with a similar size still counts a little: detectors often
 * draw a cell a few pixels larger or smaller than the schema author did.
 */
export function matchScore(expected: Box, detected: Box): number {
  const overlap = iou(expected, detected);
  const [cx, cy] = center(expected);
  const inside = cx >= detected.x && cx <= detected.x + detected.w && cy >= detected.y && cy <= detected.y + detected.h;
  const wRatio = detected.w / Math.max(1e-6, expected.w);
  const hRatio = detected.h / Math.max(1e-6, expected.h);
  const similar = wRatio > 0.5 && wRatio < 2 && hRatio > 0.5 && hRatio < 2;
  return inside && similar ? Math.max(overlap, 0.3) : overlap;
}
