import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { FormSchema } from '../../src/schema/definition.js';
import { DEMO_LAYOUTS, demoLayout, type DemoLayoutName } from '../../src/synth/layouts.js';
import { demoSchemaText } from '../../src/synth/demo-assets.js';

const root = path.resolve(import.meta.dirname, '..', '..');
const names = Object.keys(DEMO_LAYOUTS) as DemoLayoutName[];

describe('demo schemas', () => {
  for (const name of names) {
    it(`${name}: the committed YAML parses with FormSchema and matches the layout`, async () => {
      const file = path.join(root, 'schemas', `${name}.yaml`);
      const text = readFileSync(file, 'utf8');
      const schema = FormSchema.parse(parse(text));
      // The file is exactly what the layout and the demo calibration give today (regenerate with npm run samples:make).
      expect(text).toBe(demoSchemaText(name));
      expect(schema.fields.map((f) => f.name)).toEqual(demoLayout(name).fields.map((f) => f.name));
      const page = schema.pages[0];
      const blank = path.join(root, 'schemas', page.image!);
      expect(existsSync(blank)).toBe(true);
      const meta = await sharp(blank).metadata();
      expect([meta.width, meta.height]).toEqual([page.width, page.height]);
      for (const f of schema.fields) {
        const [x, y, w, h] = f.region!;
        expect(x + w).toBeLessThanOrEqual(page.width);
        expect(y + h).toBeLessThanOrEqual(page.height);
      }
      expect(new Set(schema.fields.map((f) => f.name)).size).toBe(schema.fields.length);
    });
  }

  it('clinic-intake uses every field type', () => {
    const types = new Set(demoLayout('clinic-intake').fields.map((f) => f.type));
    expect([...types].sort()).toEqual(['checkbox', 'choice', 'choice_text', 'date', 'email', 'number', 'phone', 'postal_code', 'signature', 'text']);
  });
});
