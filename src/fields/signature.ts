import { z } from 'zod';
import type { ReasonCode } from './reasons.js';
import type { FieldType } from './types.js';
import { invalidInterpretation, validInterpretation } from './interpretation.js';
import { parseYesNo } from './mark-decision.js';

/**
 * Ink coverage (see read/marks.ts inkCoverage) above which the area holds a signature. Common practice puts a
 * handwritten name at a few percent of a signature box and speckle well under one; measured on rendered areas with
 * a rule, a printed label and a heavy simulated scan (seeds 900000-900019): blank 0.0000, signed 0.031-0.135
 * (test/fields/signature-pixels.test.ts).
 */
export const DEFAULT_PRESENT_ABOVE = 0.01;

const options = z
  .object({
    presentAbove: z
      .number()
      .min(0)
      .max(1)
      .default(DEFAULT_PRESENT_ABOVE)
      .describe(`Ink coverage above which the area counts as signed (default ${DEFAULT_PRESENT_ABOVE})`),
  })
  .strict();

export type SignatureOptions = z.infer<typeof options>;

export const signatureField: FieldType<SignatureOptions> = {
  name: 'signature',
  description: 'A signature area: true when signed, judged by ink coverage (the signature itself is not read).',
  options,
  reader: 'ink',
  interpret(reading, o) {
    if (reading.kind !== 'ink') throw new Error('signature fields are read as ink coverage');
    const t = o.presentAbove;
    // Confidence 0.6 right at the threshold, 1.0 once the coverage is twice (or under half) the threshold: a faint
    // or very short signature goes to review rather than being silently called absent (common practice).
    const ratio = reading.coverage >= t ? (reading.coverage - t) / Math.max(t, 1e-6) : (t - reading.coverage) / Math.max(t, 1e-6) * 2;
    const confidence = 0.6 + 0.4 * Math.min(1, ratio);
    const reasons: ReasonCode[] = confidence < 0.75 ? ['faint_signature'] : [];
    return validInterpretation(reading.coverage >= t, confidence, reasons);
  },
  acceptedInput() {
    return 'yes (signed) or no (not signed)';
  },
  parseCorrection(text) {
    const yes = parseYesNo(text);
    return yes === null ? invalidInterpretation(['not_yes_or_no']) : validInterpretation(yes);
  },
};
