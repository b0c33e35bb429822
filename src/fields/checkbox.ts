import { z } from 'zod';
import type { ReasonCode } from './reasons.js';
import type { FieldType, Interpretation } from './types.js';
import { invalidInterpretation, validInterpretation } from './interpretation.js';
import {
  decideMark,
  markThresholds,
  NO_OUTLINE_FACTOR,
  parseYesNo,
  THRESHOLD_ORDER_MESSAGE,
  thresholdsOrdered,
} from './mark-decision.js';

const options = z.object(markThresholds).strict().refine(thresholdsOrdered, { message: THRESHOLD_ORDER_MESSAGE });

export type CheckboxOptions = z.infer<typeof options>;

export const checkboxField: FieldType<CheckboxOptions> = {
  name: 'checkbox',
  description: 'One printed box, ticked (true) or not (false), judged by the ink inside it.',
  options,
  reader: 'mark',
  interpret(reading, o): Interpretation {
    if (reading.kind !== 'marks' || reading.marks.length === 0) throw new Error('checkbox fields are read as marks');
    const mark = reading.marks[0];
    const d = decideMark(mark.fillRatio, o);
    const reasons: ReasonCode[] = mark.boxFound ? [] : ['box_not_found'];
    const confidence = d.confidence * (mark.boxFound ? 1 : NO_OUTLINE_FACTOR);
    if (d.state === 'ambiguous') return { value: null, outcome: 'ambiguous', confidence, reasons: [...reasons, 'ambiguous_mark'] };
    return validInterpretation(d.state === 'checked', confidence, reasons);
  },
  acceptedInput() {
    return 'yes (ticked) or no (not ticked)';
  },
  parseCorrection(text) {
    const yes = parseYesNo(text);
    return yes === null ? invalidInterpretation(['not_yes_or_no']) : validInterpretation(yes);
  },
};
