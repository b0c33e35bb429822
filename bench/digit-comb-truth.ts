/**
 * A comb the filler wrote digits alone into on this page (SSN, EIN, account, ZIP and date boxes): what the comb
 * benches score (bench/real-form-combs.ts) and fit on (bench/fit-digit-confidence.ts). Combs of names and words, and
 * combs left empty, are not.
 */
export function isWrittenDigitComb(f: { class: string; text: string | null }): boolean {
  return f.class === 'comb_field' && f.text !== null && /^[0-9]+$/.test(f.text);
}
