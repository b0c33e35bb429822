import { valueToCell } from '../../src/review/cell-value.js';

/** A field of a bundled sample's truth file (samples/truth, written by the generator). */
export interface TruthField {
  name: string;
  value: string | number | boolean | string[] | null;
  text: string | null;
}

/** What a person types after looking at the crop: the text as written, or for marks yes/no, "(empty)" for a blank. */
export function typedByPerson(t: TruthField): string {
  if (t.text !== null) return t.text;
  if (typeof t.value === 'boolean') return t.value ? 'yes' : 'no';
  if (t.value === null) return '(empty)';
  return valueToCell(t.value);
}
