/**
 * Measures written into a record's details and scores are rounded to three decimals: enough to compare runs, and a
 * re-run of the same input writes the same record.
 */
export function round3(v: number): number {
  return Math.round(v * 1000) / 1000;
}
