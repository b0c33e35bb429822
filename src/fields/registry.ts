import type { FieldType } from './types.js';
import { textField } from './text.js';
import { dateField } from './date.js';
import { phoneField } from './phone.js';
import { emailField } from './email.js';
import { numberField } from './number.js';
import { postalCodeField } from './postal_code.js';
import { choiceTextField } from './choice_text.js';
import { checkboxField } from './checkbox.js';
import { choiceField } from './choice.js';
import { signatureField } from './signature.js';

/**
 * Every field type the schema accepts. Adding a type = one module under src/fields/ plus one line here.
 * Order is the order listed in error messages and the JSON Schema.
 */
export const FIELD_TYPES: readonly FieldType<any>[] = [
  textField,
  dateField,
  phoneField,
  emailField,
  numberField,
  postalCodeField,
  choiceTextField,
  checkboxField,
  choiceField,
  signatureField,
];

export function fieldTypeNames(): string[] {
  return FIELD_TYPES.map((t) => t.name);
}

export function getFieldType(name: string): FieldType<any> {
  const t = FIELD_TYPES.find((f) => f.name === name);
  if (!t) throw new Error(`unknown field type "${name}"; known types: ${fieldTypeNames().join(', ')}`);
  return t;
}
