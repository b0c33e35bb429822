import type { FieldType } from './types.js';
import { textField } from './text.js';

/**
 * Every field type the schema accepts. Adding a type = one module under src/fields/ plus one line here.
 * Order is the order listed in error messages and the JSON Schema.
 */
export const FIELD_TYPES: readonly FieldType<any>[] = [textField];

export function fieldTypeNames(): string[] {
  return FIELD_TYPES.map((t) => t.name);
}

export function getFieldType(name: string): FieldType<any> {
  const t = FIELD_TYPES.find((f) => f.name === name);
  if (!t) throw new Error(`unknown field type "${name}"; known types: ${fieldTypeNames().join(', ')}`);
  return t;
}
