/**
 * A field's confidence map: a nondecreasing step function from the raw confidence `scoreField` computes to the
 * accuracy observed at that confidence on labeled forms (fitted by `formglean calibrate`, isotonic regression).
 *
 * Written in a schema as `confidenceMap: [[x, y], ...]`: from raw confidence x upward the field is right with
 * probability y, until the next point. Below the first point the first y applies. These are the levels of the
 * isotonic fit exactly (no interpolation), so a review threshold proposed on raw confidences accepts the same
 * calibration samples when it is expressed as the level's accuracy.
 */
export type ConfidenceMapPoints = readonly (readonly [number, number])[];

export function applyConfidenceMap(points: ConfidenceMapPoints, raw: number): number {
  if (points.length === 0) return raw;
  let y = points[0][1];
  for (const [x, v] of points) {
    if (x > raw) break;
    y = v;
  }
  return y;
}

/** What is wrong with a list of points, or null when it is a usable map. */
export function confidenceMapProblem(points: ConfidenceMapPoints): string | null {
  for (let i = 1; i < points.length; i++) {
    if (!(points[i][0] > points[i - 1][0])) return `point ${i}: x must increase (${points[i - 1][0]} then ${points[i][0]})`;
    if (points[i][1] < points[i - 1][1]) return `point ${i}: y must not decrease (${points[i - 1][1]} then ${points[i][1]})`;
  }
  return null;
}
