import { createHash } from 'node:crypto';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { writeIndex } from '../../src/results/index-write.js';
import { documentJsonName } from '../../src/results/layout.js';
import { okLine } from '../../src/results/results-line.js';
import type { DocumentResult } from '../../src/result/document.js';
import { documentResult, field } from './fixture.js';

/** An invented intake form's schema: one field per type the review tests correct. */
export const INTAKE_SCHEMA = `form: { name: clinic-intake, version: "1" }
pages: [{ width: 800, height: 600 }]
fields:
  - { name: owner_name, type: text, class: text_entry, region: [40, 40, 300, 30] }
  - { name: visit_date, type: date, class: text_entry, region: [40, 90, 200, 30], options: { formats: ["MM/DD/YYYY"] } }
  - { name: phone, type: phone, class: text_entry, region: [40, 140, 200, 30], options: { defaultRegion: US } }
  - { name: email, type: email, class: text_entry, region: [40, 190, 300, 30] }
  - { name: pet_name, type: text, class: text_entry, region: [40, 240, 200, 30] }
`;

/** Fields of one invented intake form as extraction might leave them: some accepted, some waiting for review. */
export function intakeFields(i: number) {
  const pad = String(i).padStart(4, '0');
  return [
    field('owner_name', 'text', `Robin Quil${i % 3 === 0 ? 'l' : ''}`, i % 3 === 0 ? 'accepted' : 'review'),
    field('visit_date', 'date', null, 'invalid', { raw: '03/1A/2026', reasons: ['invalid_date'] }),
    field('phone', 'phone', '+12075550142', 'review', { raw: '207 555 0l42', extra: { national: '(207) 555-0142' }, reasons: ['repaired_digits'] }),
    field('email', 'email', `owner${pad}@example.org`, 'accepted'),
    field('pet_name', 'text', null, 'missing', { raw: null, box: null, reasons: [] }),
  ];
}

/** A real extract-style output folder: schema file, one JSON per document, results.jsonl and summary.json. */
export async function makeResultsFolder(count: number, prefix = 'fg-review-'): Promise<{ dir: string; docs: DocumentResult[] }> {
  const dir = await mkdtemp(path.join(tmpdir(), prefix));
  const schemaPath = path.join(dir, 'clinic-intake.yaml');
  await writeFile(schemaPath, INTAKE_SCHEMA);
  const schemaSha = createHash('sha256').update(INTAKE_SCHEMA).digest('hex');
  const docs: DocumentResult[] = [];
  for (let i = 1; i <= count; i++) {
    const doc = documentResult(`intake-${String(i).padStart(4, '0')}`, intakeFields(i), schemaPath, schemaSha);
    docs.push(doc);
    // Plain writes: a fixture needs no crash safety, and fsync per file would slow large fixtures.
    await writeFile(path.join(dir, documentJsonName(doc.document.id)), JSON.stringify(doc, null, 2) + '\n');
  }
  await writeIndex(dir, docs.map(okLine));
  return { dir, docs };
}
