import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine, extractBatch, loadDetector, loadSchema } from '../../src/api.js';
import { runCalibrate } from '../../src/eval/calibration-run.js';
import { formatCalibration } from '../../src/eval/calibration-table.js';
import { errorUpperBound } from '../../src/eval/target-check.js';
import { valuesEqual } from '../../src/eval/text-metrics.js';
import { DocumentResult } from '../../src/result/document.js';
import { applyReviewQueue } from '../../src/review/apply.js';
import { valueToCell } from '../../src/review/cell-value.js';
import { typedByPerson, type TruthField } from '../support/person-answer.js';
import { resultFingerprint } from '../../src/review/result-fingerprint.js';
import { assignRowIds } from '../../src/review/row-id.js';
import { parseSchemaText } from '../../src/schema/load.js';

const repo = path.resolve(import.meta.dirname, '../..');
const dirs: string[] = [];
const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

describe('calibrate from a reviewed results folder', () => {
  it('takes confirmed fields as right and corrected ones as wrong, refuses too few, and says when the target is not shown', async () => {
    const out = await mkdtemp(path.join(tmpdir(), 'fg-cal-review-'));
    dirs.push(out);
    const schemaFile = path.join(repo, 'schemas/clinic-intake.yaml');
    const schema = await loadSchema(schemaFile);
    // The detector's skill is not under test: the small fixture model finds almost nothing, so fields are read at
    // their schema regions on the real scans and most land in the review queue, giving the person plenty to label.
    const detector = await loadDetector(path.join(repo, 'test/fixtures/models/square-scores.onnx'), { intraOpThreads: 1 });
    const inputs = ['clinic-intake-typed.png', 'clinic-intake-batch.tif'].map((f) => path.join(repo, 'samples', f));
    const report = await extractBatch({ ocr, inputs, schemas: [schema], detector, outDir: out });
    await detector.close();
    expect(report.lines.every((l) => !l.error)).toBe(true);

    // The person answers the queue from the bundled samples' truth (samples/truth, written by the generator).
    const truthOf = async (doc: string) =>
      new Map(
        (JSON.parse(await readFile(path.join(repo, 'samples/truth', `${doc}.json`), 'utf8')) as { fields: TruthField[] }).fields.map(
          (f) => [f.name, f],
        ),
      );
    const queue = path.join(out, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    // A spot check: the clerk also looks at every accepted field and adds a row for it to the queue (the row id is
    // the one formglean gives that field, the result hash the document's at export).
    const files = ['clinic-intake-typed.json', 'clinic-intake-batch.p1.json', 'clinic-intake-batch.p2.json'];
    const docs = await Promise.all(files.map(async (f) => DocumentResult.parse(JSON.parse(await readFile(path.join(out, f), 'utf8')))));
    const ids = assignRowIds(docs);
    for (const doc of docs) {
      for (const f of doc.fields.filter((x) => x.status === 'accepted')) {
        rows.push({
          ...Object.fromEntries(Object.keys(rows[0]).map((k) => [k, ''])),
          row_id: ids.get(doc.document.id)!.get(f.name)!,
          document: doc.document.id,
          result_hash: resultFingerprint(doc),
          page: String(f.page + 1),
          field: f.name,
          type: f.type,
          status: f.status,
          value: valueToCell(f.value),
        });
      }
    }
    const expected = new Map<string, boolean>(); // document/field -> read right
    for (const r of rows) {
      const t = (await truthOf(r.document)).get(r.field)!;
      const read = r.value.startsWith("'") ? r.value.slice(1) : r.value; // the queue's formula guard
      if (read === valueToCell(t.value)) r.confirm = 'yes';
      else r.correction = typedByPerson(t);
    }
    await writeFile(queue, stringify(rows, { header: true, record_delimiter: '\r\n' }));
    const applied = await applyReviewQueue(queue, out, { reviewer: 'R. Quill' });
    expect(applied.problems).toEqual([]);
    const labeled = applied.corrected + applied.confirmed;
    expect(labeled).toBe(rows.length);

    // What each reviewed field was, against the generator's truth (independent of the review record).
    for (const file of files) {
      const doc = DocumentResult.parse(JSON.parse(await readFile(path.join(out, file), 'utf8')));
      const truth = await truthOf(doc.document.id);
      for (const f of doc.fields) {
        if (f.review) expected.set(`${doc.document.id}/${f.name}`, valuesEqual(f.review.previousValue, truth.get(f.name)!.value));
      }
    }
    expect(expected.size).toBe(labeled);
    const wrong = [...expected.values()].filter((v) => !v).length;
    expect(wrong).toBe(applied.corrected);

    // The default map size (100 labels) is more than three pages give: refused, in one line, naming the need.
    const err = await runCalibrate({ results: out, schema: schemaFile, targetError: 0.005, out: path.join(out, 'x.yaml') }).catch((e: Error) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as Error).message).toContain(`only ${labeled} reviewed fields`);
    expect((err as Error).message).toContain('at least 100 are needed');
    expect((err as Error).message).not.toContain('\n');
    await expect(readFile(path.join(out, 'x.yaml'))).rejects.toThrow();

    const calibrated = path.join(out, 'clinic-intake.calibrated.yaml');
    const run = await runCalibrate({ results: out, schema: schemaFile, targetError: 0.005, minSamples: 30, out: calibrated });
    expect(run.labels).toBe('review');
    expect(run.documents).toBe(3);
    expect(run.proposal.samples).toBe(labeled);
    expect(run.proposal.fields.reduce((a, f) => a + f.errors, 0)).toBe(wrong);
    // Tens of labels cannot show 0.5 %: that takes ln(0.05)/ln(0.995) = 598 accepted fields without an error.
    expect(run.target.verdict).not.toBe('met');
    expect(run.target.needed).toBe(598);
    expect(formatCalibration(run)).toMatch(/TARGET NOT (MET|SHOWN)/);
    const copy = parseSchemaText(await readFile(calibrated, 'utf8'), calibrated);
    expect(copy.fields.some((f) => f.confidenceMap !== undefined)).toBe(true);
    expect(await readFile(calibrated, 'utf8')).toContain(`on 3 reviewed documents (${labeled} labeled fields)`);
  }, 240_000);

  it('bounds the error among accepted as the binomial does', () => {
    // No error in n: the exact one-sided 95 % bound 1 - 0.05^(1/n), about 3/n (rule of three, Hanley &
    // Lippman-Hand, JAMA 1983): 300 fields -> 0.99 %.
    expect(errorUpperBound(0, 300)).toBeCloseTo(1 - Math.pow(0.05, 1 / 300), 12);
    expect(errorUpperBound(0, 300)).toBeCloseTo(3 / 300, 3);
    // Wilson score bound (Wilson 1927), one-sided 95 % (z = 1.645), 5 errors in 100, by hand from the formula:
    // p = 0.05, z^2/n = 0.027057; (0.05 + 0.013529 + 1.645 * sqrt(0.000475 + 0.0000677)) / 1.027057 = 0.0992.
    expect(errorUpperBound(5, 100)).toBeCloseTo(0.0992, 3);
  });
});
