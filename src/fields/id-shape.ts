import { repairDigits } from './digit-repair.js';

/**
 * The output shape of an identifier: `#` stands for one digit, every other character is written as it stands
 * ("###-##-####" for a US social security number, "##-#######" for an employer number). One column of a batch then
 * has one format, whether the writer put the separators in ("793-00-4113"), left them out ("793004113") or wrote
 * in comb cells that OCR spaced apart ("7 9 3 0 0 4 1 1 3").
 */

export const SHAPE_DIGIT = '#';

export interface Shaped {
  /** The digits laid into the shape, or null when the read does not hold exactly the shape's digits. */
  value: string | null;
  /** Look-alike letters read as digits (O for 0, l for 1...): the shape says a digit stands there. */
  repairs: number;
}

/** Digits the shape holds. */
export function shapeDigits(shape: string): number {
  return [...shape].filter((c) => c === SHAPE_DIGIT).length;
}

/** Characters besides digits that OCR may return for this shape: its own separators and spaces. */
export function shapeCharacters(shape: string): string {
  const literals = [...new Set([...shape].filter((c) => c !== SHAPE_DIGIT))].join('');
  return `0123456789${literals} `;
}

/**
 * Lay what was read into the shape: whitespace, the shape's own separators and the usual ones (- . /) are dropped,
 * look-alike letters become digits, and the digits left must be exactly as many as the shape has.
 */
export function applyShape(read: string, shape: string): Shaped {
  const separators = new Set([...shape].filter((c) => c !== SHAPE_DIGIT).concat(['-', '.', '/']));
  const core = [...read].filter((c) => !/\s/.test(c) && !separators.has(c)).join('');
  const r = repairDigits(core);
  if (!/^[0-9]*$/.test(r.text) || r.text.length !== shapeDigits(shape)) return { value: null, repairs: 0 };
  let i = 0;
  const value = [...shape].map((c) => (c === SHAPE_DIGIT ? r.text[i++] : c)).join('');
  return { value, repairs: r.repairs };
}
