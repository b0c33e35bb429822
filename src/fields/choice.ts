import { z } from 'zod';
import type { ReasonCode } from './reasons.js';
import type { FieldPart, FieldType, Interpretation } from './types.js';
import { emptyInterpretation, invalidInterpretation, validInterpretation } from './interpretation.js';
import {
  choiceMargin,
  decideMark,
  decideOneOf,
  markThresholds,
  NO_OUTLINE_FACTOR,
  THRESHOLD_ORDER_MESSAGE,
  thresholdsOrdered,
} from './mark-decision.js';

const RegionTuple = z
  .tuple([z.number().min(0), z.number().min(0), z.number().positive(), z.number().positive()])
  .describe('[x, y, width, height] of this choice\'s printed box on the reference page');

const options = z
  .object({
    multiple: z.boolean().default(false).describe('Several boxes may be ticked (default false: exactly one)'),
    choices: z
      .array(z.object({ value: z.string().min(1), region: RegionTuple }).strict())
      .min(2)
      .refine((cs) => new Set(cs.map((c) => c.value)).size === cs.length, { message: 'choice values must be unique' }),
    ...markThresholds,
    margin: choiceMargin,
  })
  .strict()
  .refine(thresholdsOrdered, { message: THRESHOLD_ORDER_MESSAGE });

export type ChoiceOptions = z.infer<typeof options>;

/**
 * One answer expected: decided by the margin between the fullest box and the rest (decideOneOf). Nothing ticked, or
 * several, needs a person (a skipped question or a changed mind).
 */
function interpretOneOf(marks: readonly { fillRatio: number; boxFound: boolean }[], o: ChoiceOptions): Interpretation {
  const d = decideOneOf(marks.map((m) => m.fillRatio), o);
  const outlineMissing = marks.some((m) => !m.boxFound);
  const reasons: ReasonCode[] = outlineMissing ? ['box_not_found'] : [];
  const confidence = d.confidence * (outlineMissing ? NO_OUTLINE_FACTOR : 1);
  if (d.state === 'chosen') return validInterpretation(o.choices[d.chosen as number].value, confidence, reasons);
  const why: ReasonCode = d.state === 'none' ? 'no_choice_marked' : d.state === 'several' ? 'several_choices_marked' : 'ambiguous_mark';
  return { value: null, outcome: 'ambiguous', confidence, reasons: [...reasons, why] };
}

export const choiceField: FieldType<ChoiceOptions> = {
  name: 'choice',
  description: 'A group of printed boxes forming one answer: one value, or a list when multiple is true.',
  options,
  reader: 'mark',
  parts(o): FieldPart[] {
    return o.choices.map((c) => ({ key: c.value, region: c.region }));
  },
  interpret(reading, o): Interpretation {
    if (reading.kind !== 'marks') throw new Error('choice fields are read as marks');
    const byKey = new Map(reading.marks.map((m) => [m.key, m]));
    const marks = o.choices.map((c) => {
      const m = byKey.get(c.value);
      if (!m) throw new Error(`choice reading lacks the box for "${c.value}"`);
      return m;
    });
    if (!o.multiple) return interpretOneOf(marks, o);
    const checked: string[] = [];
    let ambiguous = false;
    let confidence = 1;
    let outlineMissing = false;
    for (const [i, c] of o.choices.entries()) {
      const m = marks[i];
      const d = decideMark(m.fillRatio, o);
      // The group is as trustworthy as its least clear box.
      confidence = Math.min(confidence, d.confidence * (m.boxFound ? 1 : NO_OUTLINE_FACTOR));
      if (!m.boxFound) outlineMissing = true;
      if (d.state === 'checked') checked.push(c.value);
      if (d.state === 'ambiguous') ambiguous = true;
    }
    const reasons: ReasonCode[] = outlineMissing ? ['box_not_found'] : [];
    if (ambiguous) return { value: null, outcome: 'ambiguous', confidence, reasons: [...reasons, 'ambiguous_mark'] };
    // "Tick all that apply" with nothing ticked answers "none": an empty list, which a required group reports missing.
    return checked.length ? validInterpretation(checked, confidence, reasons) : { value: [], outcome: 'empty', confidence, reasons };
  },
  acceptedInput(o) {
    const values = o.choices.map((c) => c.value).join(', ');
    return o.multiple ? `any of: ${values} (several separated by ;)` : `one of: ${values}`;
  },
  parseCorrection(text, o) {
    const typed = text
      .split(/[,;]/)
      .map((t) => t.trim())
      .filter((t) => t !== '');
    if (typed.length === 0) return o.multiple ? { value: [], outcome: 'empty', confidence: 1, reasons: [] } : emptyInterpretation();
    const values: string[] = [];
    for (const t of typed) {
      const hit = o.choices.find((c) => c.value.toLowerCase() === t.toLowerCase());
      if (!hit) return invalidInterpretation(['not_a_choice']);
      if (!values.includes(hit.value)) values.push(hit.value);
    }
    if (o.multiple) return validInterpretation(o.choices.map((c) => c.value).filter((v) => values.includes(v)));
    return values.length === 1 ? validInterpretation(values[0]) : invalidInterpretation(['several_choices_marked']);
  },
};
