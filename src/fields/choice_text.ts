import { distance } from 'fastest-levenshtein';
import { z } from 'zod';
import type { FieldType, Interpretation } from './types.js';
import { emptyInterpretation, invalidInterpretation, validInterpretation } from './interpretation.js';
import { ocrText } from './ocr-text.js';

const options = z
  .object({
    choices: z.array(z.string().min(1)).min(1).describe('The allowed values, stored exactly as listed here'),
    maxDistance: z
      .number()
      .int()
      .min(0)
      .optional()
      .describe('Most character edits (Levenshtein) between the text and a choice; default: a quarter of the choice length, at least 1'),
  })
  .strict();

export type ChoiceTextOptions = z.infer<typeof options>;

/** Compare without case, spaces or punctuation: OCR adds and drops those freely (common practice). */
function comparable(s: string): string {
  return s.toUpperCase().replace(/[^\p{L}\p{N}]/gu, '');
}

/**
 * Edits allowed for a choice when the schema names none: a quarter of its length, at least one — one slip in a
 * two-letter state code, two in "Pending review" (common practice for fuzzy matching of short labels).
 */
export function defaultMaxDistance(choice: string): number {
  return Math.max(1, Math.floor(comparable(choice).length / 4));
}

/** Each edit costs 15 % of the confidence, like a repaired digit (see digit-repair.ts). */
const EDIT_PENALTY = 0.85;

function interpretText(text: string, o: ChoiceTextOptions, fuzzy: boolean): Interpretation {
  const t = comparable(text);
  if (t === '') return emptyInterpretation();
  const scored = o.choices.map((choice) => ({ choice, d: distance(t, comparable(choice)) }));
  const best = Math.min(...scored.map((s) => s.d));
  const winners = scored.filter((s) => s.d === best);
  if (best === 0) return validInterpretation(winners[0].choice);
  const allowed = winners.filter((s) => s.d <= (fuzzy ? (o.maxDistance ?? defaultMaxDistance(s.choice)) : 0));
  if (allowed.length === 0) return invalidInterpretation(['not_a_choice']);
  const confidence = Math.pow(EDIT_PENALTY, best);
  // "MX" is one edit from MA, MD, ME, MI, MN, MO, MS and MT: no ground to pick one. Nor when the next choice is not
  // at least twice as far: "District of Mon" (a clipped "District of Montana") is 3 edits from "District of Maine" and
  // 4 from Montana, and was accepted as Maine on the real-form bench; "V7" is 1 from VT and 2 from every other code.
  const runnerUp = Math.min(...scored.filter((s) => s.d > best).map((s) => s.d));
  if (allowed.length > 1 || runnerUp < 2 * best) return { value: null, outcome: 'ambiguous', confidence, reasons: ['ambiguous_choice'] };
  return validInterpretation(allowed[0].choice, confidence, ['fuzzy_choice_match']);
}

export const choiceTextField: FieldType<ChoiceTextOptions> = {
  name: 'choice_text',
  description: 'Text that must be one of a listed set (e.g. state codes), matched by edit distance.',
  options,
  reader: 'ocr',
  ocrDefaults: () => ({ mode: 'line' }),
  interpret(reading, o) {
    return interpretText(ocrText(reading, 'choice_text'), o, true);
  },
  acceptedInput(o) {
    return `one of: ${o.choices.join(', ')}`;
  },
  parseCorrection(text, o) {
    return interpretText(text, o, false);
  },
};
