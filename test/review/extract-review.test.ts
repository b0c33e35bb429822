import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine, extractBatch, loadDetector, loadSchema } from '../../src/api.js';
import { DocumentResult } from '../../src/result/document.js';
import { applyReviewQueue } from '../../src/review/apply.js';
import { readAudit } from '../../src/review/audit.js';
import { valueToCell } from '../../src/review/cell-value.js';
import { typedByPerson, type TruthField } from '../support/person-answer.js';

const repo = path.resolve(import.meta.dirname, '../..');
const dirs: string[] = [];
const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

async function snapshot(dir: string): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  for (const e of await readdir(dir, { recursive: true, withFileTypes: true })) {
    if (e.isFile()) out.set(path.relative(dir, path.join(e.parentPath, e.name)), (await readFile(path.join(e.parentPath, e.name))).toString('base64'));
  }
  return out;
}

describe('extract, review in a spreadsheet, apply', () => {
  it('brings a reviewer\'s answers into the results of a real extract run, once', async () => {
    const out = await mkdtemp(path.join(tmpdir(), 'fg-review-e2e-'));
    dirs.push(out);
    const schema = await loadSchema(path.join(repo, 'schemas/clinic-intake.yaml'));
    // The detector's skill is not under test here: a tiny fixture model finds almost nothing, so fields are read
    // from the schema's regions on the real scan and land in the review queue (region_fallback).
    const detector = await loadDetector(path.join(repo, 'test/fixtures/models/square-scores.onnx'), { intraOpThreads: 1 });
    const sample = path.join(repo, 'samples/clinic-intake-typed.png');
    const report = await extractBatch({ ocr, inputs: [sample], schemas: [schema], detector, outDir: out });
    await detector.close();
    expect(report.lines[0].error ?? "ok").toBe("ok");

    const truth = JSON.parse(await readFile(path.join(repo, 'samples/truth/clinic-intake-typed.json'), 'utf8')) as { fields: TruthField[] };
    const byName = new Map(truth.fields.map((f) => [f.name, f]));
    const queue = path.join(out, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    expect(rows.length).toBeGreaterThan(3);
    for (const r of rows.filter((x) => x.crop !== '')) await readFile(path.join(out, 'review', r.crop)); // crops exist

    // The person: confirms what was read right, types what was read wrong, and mistypes one date.
    const badDate = rows.find((r) => r.type === 'date')!;
    expect(badDate).toBeDefined();
    for (const r of rows) {
      const t = byName.get(r.field)!;
      const read = r.value.startsWith("'") ? r.value.slice(1) : r.value; // the queue's formula guard, as the eye skips it
      if (r === badDate) r.correction = '02/30/2026'; // no 30 February in the Gregorian calendar
      else if (read === valueToCell(t.value)) r.confirm = 'yes';
      else r.correction = typedByPerson(t);
    }
    await writeFile(queue, stringify(rows, { header: true, record_delimiter: '\r\n' }));

    const applied = await applyReviewQueue(queue, out, { reviewer: 'R. Quill' });
    expect(applied.problems.map((p) => p.line)).toEqual([rows.indexOf(badDate) + 2]);
    expect(applied.corrected + applied.confirmed).toBe(rows.length - 1);

    const doc = DocumentResult.parse(JSON.parse(await readFile(path.join(out, 'clinic-intake-typed.json'), 'utf8')));
    for (const r of rows) {
      const f = doc.fields.find((x) => x.name === r.field)!;
      if (r === badDate) {
        expect(f.status).toBe(r.status);
        continue;
      }
      // The generator's truth is the reference: every reviewed field now holds the true normalized value.
      expect({ field: f.name, value: f.value }).toEqual({ field: f.name, value: byName.get(f.name)!.value });
      expect(f.status).toBe(r.confirm === 'yes' ? 'confirmed' : 'corrected');
      expect(f.review).toMatchObject({ reviewer: 'R. Quill', previousStatus: r.status });
    }
    const audit = await readAudit(path.join(out, 'review', 'audit.jsonl'));
    expect(audit).toHaveLength(rows.length - 1);
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.fields.byStatus.corrected + summary.fields.byStatus.confirmed).toBe(rows.length - 1);
    expect(summary.fields.byStatus).toMatchObject(doc.counts);

    const before = await snapshot(out);
    const again = await applyReviewQueue(queue, out, { reviewer: 'R. Quill' });
    expect(again.corrected + again.confirmed).toBe(0);
    expect(await snapshot(out)).toEqual(before);
  });
});
