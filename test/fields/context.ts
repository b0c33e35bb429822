import type { FieldType, Interpretation } from '../../src/fields/types.js';
import { getFieldType } from '../../src/fields/registry.js';

/** A fixed "today" so that not-in-the-future checks are reproducible. */
export const TODAY = new Date(2025, 5, 15, 12, 0, 0);

/** Interpret OCR text with a registered type and schema-style options (defaults applied by the type's zod object). */
export function readAs(type: string, text: string, options: unknown = {}, confidence = 0.95): Interpretation {
  const t: FieldType<unknown> = getFieldType(type);
  const o = t.options.parse(options);
  const words = text.split(/\s+/).filter(Boolean).map((w) => ({ text: w, confidence }));
  return t.interpret({ kind: 'text', text, words, confidence }, o, { today: TODAY });
}

/** A reviewer's typed correction through the same type. */
export function correctAs(type: string, text: string, options: unknown = {}): Interpretation {
  const t: FieldType<unknown> = getFieldType(type);
  return t.parseCorrection(text, t.options.parse(options), { today: TODAY });
}
