import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { formSchemaJsonSchema } from '../../src/schema/json-schema.js';

const REPO = path.resolve(import.meta.dirname, '../..');

describe('JSON Schema of the schema file', () => {
  it('is generated from the zod definition and the committed copy is current (npm run schema:json)', async () => {
    const committed = JSON.parse(await readFile(path.join(REPO, 'schemas/form-schema.json'), 'utf8'));
    expect(committed).toEqual(formSchemaJsonSchema());
  });

  it('describes every field type with its own options, for editor completion', () => {
    const json = JSON.stringify(formSchemaJsonSchema());
    for (const t of ['text', 'date', 'phone', 'email', 'number', 'postal_code', 'choice_text', 'checkbox', 'choice', 'signature']) {
      expect(json).toContain(`"const":"${t}"`);
    }
    // JSON Schema 2020-12 is what zod emits and what current editors read (json-schema.org/draft/2020-12).
    expect(formSchemaJsonSchema().$schema).toBe('https://json-schema.org/draft/2020-12/schema');
  });
});
