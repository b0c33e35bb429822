import { ocrFactor } from './scoring.js';
import type { Interpretation, Reading } from './types.js';

/**
 * Form legibility: how well the other fields of the same form read. One writer fills a whole form, so when most
 * of its fields come back with weak OCR (a hard hand, a poor scan), even a field OCR is sure of deserves less
 * trust: on our development set (seeds 800101-800302), tesseract was often as sure of its wrong reads of
 * handwriting-style fills as of its right ones, while the mean OCR factor of a form told typed forms (0.78..0.94, 8 of
 * 60 under 0.85) from handwritten ones (0.36..0.85, all 60 under 0.85).
 *
 * The factor is min(1, L / LEGIBILITY_KNEE), L the mean OCR factor of the form's other non-blank OCR-read fields:
 * a form that reads well costs nothing, a poorly read one scales its OCR fields down in proportion. It applies to
 * OCR-read fields only (ticks and ink are read without OCR) and needs at least MIN_OTHERS other fields, else 1.
 * The knee is a judgement from the development-set distribution above, not a fitted value; the confidence map a
 * calibration fits on top takes care of the scale.
 */
export const LEGIBILITY_KNEE = 0.85;
export const MIN_OTHERS = 3;

interface ReadOutcome {
  reading: Reading | null;
  interpretation: Interpretation | null;
}

function ocrEvidence(o: ReadOutcome): number | null {
  if (o.reading?.kind !== 'text' || !o.interpretation || o.interpretation.outcome === 'empty') return null;
  return ocrFactor(o.reading);
}

/** Legibility factor of each outcome (1 for fields not read by OCR or forms with too few other OCR fields). */
export function legibilityFactors(outcomes: readonly ReadOutcome[]): number[] {
  const evidence = outcomes.map(ocrEvidence);
  const present = evidence.filter((e): e is number => e !== null);
  const total = present.reduce((a, b) => a + b, 0);
  return evidence.map((own) => {
    if (own === null) return 1;
    const others = present.length - 1;
    if (others < MIN_OTHERS) return 1;
    const mean = (total - own) / others;
    return Math.min(1, mean / LEGIBILITY_KNEE);
  });
}
