import type { ReasonCode } from './reasons.js';
import type { FieldValue, Interpretation } from './types.js';

/** Nothing on the form: blank area, blank correction. */
export function emptyInterpretation(reasons: ReasonCode[] = []): Interpretation {
  return { value: null, outcome: 'empty', confidence: 1, reasons };
}

/** Text was there but fails the type's checks; no normalized value (the record keeps the text read, status invalid). */
export function invalidInterpretation(reasons: ReasonCode[], confidence = 1): Interpretation {
  return { value: null, outcome: 'invalid', confidence, reasons };
}

export function validInterpretation(
  value: FieldValue,
  confidence = 1,
  reasons: ReasonCode[] = [],
  extra?: Interpretation['extra'],
): Interpretation {
  return extra ? { value, outcome: 'valid', confidence, reasons, extra } : { value, outcome: 'valid', confidence, reasons };
}
