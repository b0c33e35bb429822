import { cp, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OcrEngine, extractBatch, loadDetector, loadSchema } from '../../src/api.js';
import { DEFAULT_MODEL_PATH } from '../../src/models.js';
import { DocumentResult } from '../../src/result/document.js';
import { applyAnswers, applyReviewQueue } from '../../src/review/apply.js';
import { readAudit } from '../../src/review/audit.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { readResultsFolder } from '../../src/review/result-store.js';
import { reviewStatus } from '../../src/review/status.js';
import { recordTablesByLayout } from '../../src/review/export-table.js';

/**
 * A scan of a form none of the given schemas describes: the marina's slip-rental page read with only the clinic's and
 * the garden plot's schemas. The review queue asks one question of it (which form is it?) instead of one row per
 * field, and the answer is carried into the record.
 */
const repo = path.resolve(import.meta.dirname, '../..');
const dirs: string[] = [];
let extracted = '';
const ocr = new OcrEngine();

type Row = Record<string, string>;

async function queueRows(dir: string): Promise<Row[]> {
  await writeReviewQueue(dir, (await readResultsFolder(dir)).documents.map((d) => d.result));
  return parse(await readFile(path.join(dir, 'review', 'queue.csv')), { bom: true, columns: true }) as Row[];
}

async function copyOfRun(): Promise<string> {
  const dir = await mkdtemp(path.join(tmpdir(), 'fg-layout-q-'));
  dirs.push(dir);
  await cp(extracted, dir, { recursive: true });
  return dir;
}

async function answer(dir: string, rows: Row[], cells: Partial<Row>): Promise<Awaited<ReturnType<typeof applyReviewQueue>>> {
  // The answered copy is kept beside the queue, which the test writes afresh from the records after each answer.
  const queue = path.join(dir, 'review', 'answered.csv');
  const edited = rows.map((r) => (r.field === '(layout)' ? { ...r, ...cells } : r));
  await writeFile(queue, stringify(edited, { header: true, columns: Object.keys(rows[0]) }));
  return applyReviewQueue(queue, dir, { reviewer: 'tester', now: new Date('2026-12-02T12:00:00Z') });
}

async function record(dir: string, id: string): Promise<DocumentResult> {
  return DocumentResult.parse(JSON.parse(await readFile(path.join(dir, `${id}.json`), 'utf8')));
}

const inputs = [path.join(repo, 'samples/marina-slip-typed.jpg'), path.join(repo, 'samples/clinic-intake-typed.png')];
const runSchemas = async () => [await loadSchema(path.join(repo, 'schemas/clinic-intake.yaml')), await loadSchema(path.join(repo, 'schemas/garden-plot.yaml'))];

beforeAll(async () => {
  extracted = await mkdtemp(path.join(tmpdir(), 'fg-layout-run-'));
  dirs.push(extracted);
  const detector = await loadDetector(DEFAULT_MODEL_PATH, { intraOpThreads: 1 });
  const report = await extractBatch({ ocr, inputs, schemas: await runSchemas(), detector, outDir: extracted });
  await detector.close();
  expect(report.lines.map((l) => l.error ?? 'ok')).toEqual(['ok', 'ok']);
}, 240_000);

afterAll(async () => {
  await ocr.close();
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

describe('a document of unknown layout in the review queue', () => {
  it('has one row, with the whole first page as its crop, and no row per field', async () => {
    const marina = await record(extracted, 'marina-slip-typed');
    expect(marina.layout?.status).toBe('unknown_layout');
    expect(marina.fields.filter((f) => f.status !== 'accepted').length).toBeGreaterThan(5);
    const rows = await queueRows(extracted);
    const own = rows.filter((r) => r.document === 'marina-slip-typed');
    expect(own).toHaveLength(1);
    expect(own[0]).toMatchObject({ field: '(layout)', type: 'layout', status: 'review', reasons: 'unknown_layout', value: marina.schema.name });
    expect(own[0].raw).toMatch(/^(clinic-intake|garden-plot) \d\.\d\d; (clinic-intake|garden-plot) \d\.\d\d$/);
    const crop = await sharp(path.join(extracted, 'review', own[0].crop)).metadata();
    expect(crop.width).toBe(1000);
    expect(crop.height! / crop.width!).toBeGreaterThan(1); // a portrait page, whole
    // The clinic scan, whose layout is known, keeps its rows per field.
    expect(rows.filter((r) => r.document === 'clinic-intake-typed' && r.field !== '(layout)').length).toBeGreaterThan(0);
    expect(rows.some((r) => r.document === 'clinic-intake-typed' && r.field === '(layout)')).toBe(false);
    const status = reviewStatus((await readResultsFolder(extracted)).documents.map((d) => d.result));
    expect(status.layoutQuestions).toEqual(['marina-slip-typed']);
    // The index says so too, for whoever reads results.jsonl.
    const index = (await readFile(path.join(extracted, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(Object.fromEntries(index.map((l) => [l.document, l.unknownLayout ?? false]))).toEqual({ 'marina-slip-typed': true, 'clinic-intake-typed': false });
  });

  it('answered "(none)", leaves the queue and is listed as set aside; the answer is in the record and the audit log', async () => {
    const dir = await copyOfRun();
    const report = await answer(dir, await queueRows(dir), { correction: '(none)', note: 'a marina form' });
    expect(report.problems).toEqual([]);
    expect(report.corrected).toBe(1);
    const marina = await record(dir, 'marina-slip-typed');
    expect(marina.layout?.review).toMatchObject({ decision: 'not_a_form', reviewer: 'tester', note: 'a marina form' });
    expect(marina.counts.accepted).toBe(0);
    expect((await queueRows(dir)).some((r) => r.document === 'marina-slip-typed')).toBe(false);
    const status = reviewStatus((await readResultsFolder(dir)).documents.map((d) => d.result));
    expect(status.setAside).toEqual([{ document: 'marina-slip-typed', decision: 'not_a_form' }]);
    // Nor is it exported as a record of the form it was read as.
    const tables = recordTablesByLayout((await readResultsFolder(dir)).documents.map((d) => d.result));
    expect([...tables.values()].flatMap((t) => t.rows.map((r) => r['document.id']))).toEqual(['clinic-intake-typed']);
    const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ document: 'marina-slip-typed', field: '(layout)', action: 'corrected', value: null, previousStatus: 'review' });
    // Applying the same queue again changes nothing.
    const again = await applyReviewQueue(path.join(dir, 'review', 'answered.csv'), dir, { reviewer: 'tester' });
    expect(again.alreadyApplied).toBe(1);
    expect(again.documentsWritten).toBe(0);
  });

  it('answered with another form\'s name, is set aside to be read again with that schema; a name not offered is refused by line', async () => {
    const dir = await copyOfRun();
    const rows = await queueRows(dir);
    const marina = await record(dir, 'marina-slip-typed');
    const other = marina.schema.name === 'garden-plot' ? 'clinic-intake' : 'garden-plot';
    const refused = await answer(dir, rows, { correction: 'marina-slip' });
    expect(refused.problems).toHaveLength(1);
    expect(refused.problems[0].message).toContain('(none)');
    expect(refused.problems[0].message).toContain(other);
    const taken = await answer(dir, rows, { correction: other.toUpperCase() });
    expect(taken.problems).toEqual([]);
    expect((await record(dir, 'marina-slip-typed')).layout?.review).toMatchObject({ decision: 'other_form', schema: other });
    const status = reviewStatus((await readResultsFolder(dir)).documents.map((d) => d.result));
    expect(status.setAside).toEqual([{ document: 'marina-slip-typed', decision: 'other_form', schema: other }]);

    // extract --resume reads it again with the named form's schema alone, and keeps the unchanged clinic record.
    const detector = await loadDetector(DEFAULT_MODEL_PATH, { intraOpThreads: 1 });
    const reused: string[] = [];
    const report = await extractBatch({
      ocr,
      inputs,
      schemas: await runSchemas(),
      detector,
      outDir: dir,
      resume: true,
      onInput: (e) => e.reused && reused.push(path.basename(e.file)),
    });
    await detector.close();
    expect(report.lines.map((l) => l.error ?? 'ok')).toEqual(['ok', 'ok']);
    expect(reused).toEqual(['clinic-intake-typed.png']);
    const reread = await record(dir, 'marina-slip-typed');
    expect(reread.schema.name).toBe(other);
    expect(reread.layout).toMatchObject({ status: 'assigned', review: { decision: 'other_form', schema: other, reviewer: 'tester' } });
    expect(reread.fields.every((f) => !f.reasons.includes('unknown_layout'))).toBe(true);
    const rows2 = await queueRows(dir);
    expect(rows2.filter((r) => r.document === 'marina-slip-typed').every((r) => r.field !== '(layout)')).toBe(true);
    expect(reviewStatus((await readResultsFolder(dir)).documents.map((d) => d.result)).setAside).toEqual([]);
  }, 240_000);

  it('confirmed, gives the held-back fields their own status back, and its doubtful fields come to the queue one by one; undoing asks again', async () => {
    const dir = await copyOfRun();
    const before = await record(dir, 'marina-slip-typed');
    const held = before.layout?.heldBack ?? [];
    const rows = await queueRows(dir);
    const report = await answer(dir, rows, { confirm: 'yes' });
    expect(report.problems).toEqual([]);
    expect(report.confirmed).toBe(1);
    const after = await record(dir, 'marina-slip-typed');
    expect(after.layout).toMatchObject({ status: 'unknown_layout', review: { decision: 'confirmed', reviewer: 'tester' } });
    expect(after.fields.every((f) => !f.reasons.includes('unknown_layout'))).toBe(true);
    expect(after.counts.accepted).toBe(held.length);
    for (const name of held) expect(after.fields.find((f) => f.name === name)?.status).toBe('accepted');
    const next = (await queueRows(dir)).filter((r) => r.document === 'marina-slip-typed');
    expect(next.map((r) => r.field)).toEqual(after.fields.filter((f) => ['review', 'missing', 'invalid'].includes(f.status)).map((f) => f.name));

    // The review page may undo the answer: the question is asked again and nothing of the form is accepted.
    const layoutRow = rows.find((r) => r.field === '(layout)')!;
    const now = (await readResultsFolder(dir)).documents.find((d) => d.result.document.id === 'marina-slip-typed')!;
    const { resultFingerprint } = await import('../../src/review/result-fingerprint.js');
    const undone = await applyAnswers(
      dir,
      [{ line: 2, rowId: layoutRow.row_id, resultHash: resultFingerprint(now.raw), action: { kind: 'revert' } }],
      { queue: 'review page', via: 'page' },
      { reviewer: 'tester' },
    );
    expect(undone.problems).toEqual([]);
    expect(undone.reverted).toBe(1);
    const reverted = await record(dir, 'marina-slip-typed');
    expect(reverted.layout?.status).toBe('unknown_layout');
    expect(reverted.layout?.review).toBeUndefined();
    expect(reverted.counts.accepted).toBe(0);
    expect((await queueRows(dir)).filter((r) => r.document === 'marina-slip-typed').map((r) => r.field)).toEqual(['(layout)']);
  });
});
