import { z } from 'zod';
import { FormSchema } from './definition.js';

/** The JSON Schema of the form-schema file, for editors (`$schema`), generated from the one zod definition. */
export function formSchemaJsonSchema(): Record<string, unknown> {
  const json = z.toJSONSchema(FormSchema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  return {
    ...json,
    $id: 'https://formglean.example.org/form-schema.json',
    title: 'formglean form schema',
    description: 'A form layout: reference pages and the fields to read from them.',
  };
}
