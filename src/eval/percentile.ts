/**
 * The p-th percentile (0..100) of a sample, interpolating linearly between the two nearest ranks (the default
 * method of numpy.percentile and R type 7; common practice). 0 for an empty sample.
 */
export function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) return 0;
  const s = [...values].sort((a, b) => a - b);
  const rank = (Math.min(100, Math.max(0, p)) / 100) * (s.length - 1);
  const lo = Math.floor(rank);
  const hi = Math.ceil(rank);
  return s[lo] + (s[hi] - s[lo]) * (rank - lo);
}
