import type { FieldResult } from '../result/document.js';

/** Separator between the values of a multiple-choice answer in one cell. */
export const LIST_SEPARATOR = '; ';

/** A field value as one text cell: lists joined, booleans as true/false, null as an empty cell. */
export function valueToCell(value: FieldResult['value']): string {
  if (value === null) return '';
  if (Array.isArray(value)) return value.join(LIST_SEPARATOR);
  return String(value);
}

/** Confidence to three decimals, without trailing zeros (enough to sort and filter by in a spreadsheet). */
export function confidenceToCell(c: number): string {
  return String(Math.round(c * 1000) / 1000);
}
