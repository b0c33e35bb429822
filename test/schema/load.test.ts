import { mkdtemp, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDetector } from '../../src/detect/onnx-detector.js';
import { checkSchemaAgainstClasses } from '../../src/schema/consistency.js';
import { loadSchema, parseSchemaText } from '../../src/schema/load.js';

const GOOD = `
form: { name: Test intake, version: "1" }
pages: [{ width: 1700, height: 2200 }]
fields:
  - { name: owner_name, type: text, class: text_entry, region: [100, 200, 600, 60], required: true }
  - name: visit_date
    type: date
    class: text_entry
    region: [800, 200, 300, 60]
    options: { formats: ["MM/DD/YYYY"] }
  - { name: reminders, type: checkbox, class: checkbox, region: [100, 400, 30, 30] }
`;

async function tempFile(name: string, text: string): Promise<string> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'fg-schema-'));
  const file = path.join(dir, name);
  await writeFile(file, text);
  return file;
}

describe('schema file loading', () => {
  it('parses YAML, fills defaults and hashes the file', async () => {
    const file = await tempFile('ok.yaml', GOOD);
    const loaded = await loadSchema(file);
    expect(loaded.schema.fields.map((f) => f.name)).toEqual(['owner_name', 'visit_date', 'reminders']);
    // No schema-wide threshold unless the file sets one: the shipped per type and script thresholds apply.
    expect(loaded.schema.defaults.reviewThreshold).toBeUndefined();
    expect(loaded.schema.defaults.padding).toBe(4);
    expect(loaded.schema.fields[1].page).toBe(0);
    expect(loaded.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('names the file, the JSON path, the expectation and the value for a bad region', () => {
    const bad = GOOD.replace('[100, 200, 600, 60]', '[100, 200, 600, -5]');
    expect(() => parseSchemaText(bad, 'bad.yaml')).toThrow(/^bad\.yaml: fields\[0\]\.region\[3\]: .*>0.*\(found -5\)$/);
  });

  it('lists the known types for an unknown field type', () => {
    const bad = GOOD.replace('type: checkbox', 'type: tickbox');
    expect(() => parseSchemaText(bad, 's.yaml')).toThrow(/fields\[2\]\.type: unknown field type; known types: text, date, phone/);
  });

  it('refuses duplicate names and regions outside the reference page', () => {
    const dup = GOOD.replace('name: visit_date', 'name: owner_name');
    expect(() => parseSchemaText(dup, 's.yaml')).toThrow(/fields\[1\]\.name: duplicate field name "owner_name"/);
    const outside = GOOD.replace('[800, 200, 300, 60]', '[1600, 200, 300, 60]');
    expect(() => parseSchemaText(outside, 's.yaml')).toThrow(/fields\[1\]: region .* must lie inside the 1700x2200 reference page/);
  });

  it('takes a confidence map and refuses one that is not a nondecreasing step function, in one line', () => {
    const ok = GOOD.replace('required: true }', 'required: true, confidenceMap: [[0.3, 0.5], [0.8, 0.99]] }');
    expect(parseSchemaText(ok, 's.yaml').fields[0].confidenceMap).toEqual([[0.3, 0.5], [0.8, 0.99]]);
    const down = GOOD.replace('required: true }', 'required: true, confidenceMap: [[0.3, 0.9], [0.8, 0.5]] }');
    expect(() => parseSchemaText(down, 's.yaml')).toThrow(/^s\.yaml: fields\[0\]\.confidenceMap: point 1: y must not decrease \(0\.9 then 0\.5\) \(found \[\[0\.3,0\.9\],\[0\.8,0\.5\]\]\)$/);
    const back = GOOD.replace('required: true }', 'required: true, confidenceMap: [[0.8, 0.5], [0.3, 0.9]] }');
    expect(() => parseSchemaText(back, 's.yaml')).toThrow(/confidenceMap: point 1: x must increase/);
  });

  it('reports YAML syntax errors with a line number, and a missing file plainly', async () => {
    expect(() => parseSchemaText('form: [unclosed\nfields: x', 'broken.yaml')).toThrow(/^broken\.yaml: not valid YAML\/JSON/);
    await expect(loadSchema('/nonexistent/schema.yaml')).rejects.toThrow('/nonexistent/schema.yaml: schema file not found');
  });

  it('checks detector classes against a real ONNX model', async () => {
    const detector = await loadDetector('test/fixtures/models/square-scores.onnx');
    const schema = parseSchemaText(GOOD.replace('class: checkbox', 'class: tick_mark'), 's.yaml');
    const problems = checkSchemaAgainstClasses(schema, detector.classNames);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/^fields\[2\]\.class: class "tick_mark" is not in the model/);
  });
});
