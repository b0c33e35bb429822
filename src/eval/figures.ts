/** A share as a percentage for the evaluation tables ("12.5%"); '-' where there is none. */
export function pct(v: number | null, digits = 1): string {
  return v === null ? '-' : `${(v * 100).toFixed(digits)}%`;
}

/** A figure with a fixed number of decimals for the evaluation tables; '-' where there is none. */
export function num(v: number | null, digits: number): string {
  return v === null ? '-' : v.toFixed(digits);
}

/** A share as a percentage in a sentence, two decimals with a space before the sign ("0.75 %"). */
export function percentInText(v: number): string {
  return `${(v * 100).toFixed(2)} %`;
}
