import type { Detection } from '../detect/types.js';
import type { Box } from '../image/geometry.js';
import type { ExpectedPart } from './expected-boxes.js';
import { matchScore } from './match-score.js';

/** Greedy one-to-one matching of expected regions (already on the page) to same-class detections by match score. */
export function greedyMatch(
  parts: readonly ExpectedPart[],
  expectedOnPage: readonly (Box | null)[],
  detections: readonly Detection[],
  minScore: number,
): Map<number, number> {
  const pairs: { p: number; d: number; s: number }[] = [];
  parts.forEach((part, p) => {
    const e = expectedOnPage[p];
    if (!e) return;
    detections.forEach((det, d) => {
      if (det.className !== part.className) return;
      const s = matchScore(e, det.box);
      if (s >= minScore) pairs.push({ p, d, s });
    });
  });
  pairs.sort((a, b) => b.s - a.s || a.p - b.p || a.d - b.d);
  const byPart = new Map<number, number>();
  const usedDet = new Set<number>();
  for (const { p, d } of pairs) {
    if (byPart.has(p) || usedDet.has(d)) continue;
    byPart.set(p, d);
    usedDet.add(d);
  }
  return byPart;
}
