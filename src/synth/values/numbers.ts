import type { Rng } from '../prng.js';

/** Ranges for invented measured quantities, by value kind: [min, max, decimals]. */
const NUMBER_KINDS: Record<string, readonly [number, number, number]> = {
  weight_kg: [0.8, 48, 1],
  weight_lb: [2, 105, 1],
  boat_length_ft: [14, 62, 0],
  beam_ft: [5, 18, 1],
  draft_ft: [1.5, 7, 1],
  nights: [1, 30, 0],
  count: [1, 6, 0],
  plot_size_sqft: [50, 400, 0],
  amount: [10, 480, 2],
  age_years: [1, 19, 0],
  household: [1, 7, 0],
};

export function isNumberKind(kind: string): boolean {
  return kind in NUMBER_KINDS;
}

/** A number of the kind, as [value, text with the field's decimal separator]. */
export function drawNumber(rng: Rng, kind: string, decimalSeparator: '.' | ','): { value: number; text: string } {
  const [lo, hi, decimals] = NUMBER_KINDS[kind] ?? NUMBER_KINDS.count;
  const scale = 10 ** decimals;
  const value = Math.round(rng.range(lo, hi) * scale) / scale;
  const text = value.toFixed(decimals).replace('.', decimalSeparator);
  return { value, text };
}
