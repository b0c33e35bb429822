import { readdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { parsePhoneNumberFromString } from 'libphonenumber-js/max';
import { afterAll, describe, expect, it } from 'vitest';
import { FormgleanError } from '../../src/errors.js';
import { DocumentResult } from '../../src/result/document.js';
import { applyReviewQueue } from '../../src/review/apply.js';
import { readAudit } from '../../src/review/audit.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { makeResultsFolder } from './results-folder.js';

const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

type Row = Record<string, string>;

async function exported(count: number): Promise<{ dir: string; queue: string; rows: Row[] }> {
  const { dir, docs } = await makeResultsFolder(count);
  dirs.push(dir);
  await writeReviewQueue(dir, docs);
  const queue = path.join(dir, 'review', 'queue.csv');
  const rows = parse(await readFile(queue), { bom: true, columns: true }) as Row[];
  return { dir, queue, rows };
}

/** Save the queue as a spreadsheet might: no BOM, CRLF, columns in another order, one column of the reviewer's own. */
async function saveAsSpreadsheet(file: string, rows: Row[]): Promise<void> {
  const columns = ['note', 'correction', 'confirm', 'document', 'field', 'value', 'row_id', 'result_hash', 'my_initials'];
  const text = stringify(rows.map((r) => ({ ...r, my_initials: 'RQ' })), { header: true, columns, record_delimiter: '\r\n' });
  await writeFile(file, text);
}

function pick(rows: Row[], document: string, field: string): Row {
  const r = rows.find((x) => x.document === document && x.field === field);
  if (!r) throw new Error(`no row ${document}/${field}`);
  return r;
}

async function snapshot(dir: string): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  for (const e of await readdir(dir, { recursive: true, withFileTypes: true })) {
    if (!e.isFile()) continue;
    const p = path.join(e.parentPath, e.name);
    out.set(path.relative(dir, p), (await readFile(p)).toString('base64'));
  }
  return out;
}

async function readDoc(dir: string, id: string): Promise<DocumentResult> {
  return DocumentResult.parse(JSON.parse(await readFile(path.join(dir, `${id}.json`), 'utf8')));
}

describe('review apply', () => {
  it('applies a reviewer\'s corrections and confirmations, refuses an invalid date by line, and is a no-op the second time', async () => {
    const { dir, queue, rows } = await exported(3);
    expect(rows).toHaveLength(11);
    // A person's edits.
    pick(rows, 'intake-0001', 'visit_date').correction = '03/14/2026';
    pick(rows, 'intake-0001', 'phone').confirm = 'yes';
    pick(rows, 'intake-0001', 'owner_name').correction = 'Robin Quill';
    Object.assign(pick(rows, 'intake-0001', 'pet_name'), { correction: 'Biscuit', note: 'name from the vaccination card' });
    pick(rows, 'intake-0002', 'visit_date').correction = '02/30/2026';
    pick(rows, 'intake-0002', 'phone').correction = '(207) 555-0199';
    pick(rows, 'intake-0003', 'phone').confirm = 'Yes ';
    const edited = rows.filter((r) => !(r.document === 'intake-0003' && r.field === 'pet_name'));
    await saveAsSpreadsheet(queue, edited);
    const badLine = edited.findIndex((r) => r.document === 'intake-0002' && r.field === 'visit_date') + 2; // header is line 1

    const now = new Date('2026-03-20T09:30:00.000Z');
    const report = await applyReviewQueue(queue, dir, { reviewer: 'R. Quill', now });
    expect(report).toMatchObject({ corrected: 4, confirmed: 2, alreadyApplied: 0, unanswered: 3, documentsWritten: 3 });
    expect(report.extraColumns).toEqual(['my_initials']);
    expect(report.problems).toHaveLength(1);
    expect(report.problems[0].line).toBe(badLine);
    expect(report.problems[0].message).toMatch(/visit_date.*not a valid date \(invalid_date\); the field accepts a date as MM\/DD\/YYYY or YYYY-MM-DD;/);
    expect(report.problems[0].message).not.toContain('02/30'); // logs carry no field values

    const d1 = await readDoc(dir, 'intake-0001');
    const f1 = Object.fromEntries(d1.fields.map((f) => [f.name, f]));
    // ISO 8601-1:2019 calendar date, complete extended format YYYY-MM-DD.
    expect(f1.visit_date).toMatchObject({ value: '2026-03-14', status: 'corrected' });
    expect(f1.visit_date.review).toEqual({ previousValue: null, previousStatus: 'invalid', reviewer: 'R. Quill', at: now.toISOString() });
    expect(f1.phone).toMatchObject({ value: '+12075550142', status: 'confirmed', review: { previousStatus: 'review' } });
    expect(f1.owner_name).toMatchObject({ value: 'Robin Quill', status: 'corrected', review: { previousValue: 'Robin Quil' } });
    expect(f1.pet_name).toMatchObject({ value: 'Biscuit', status: 'corrected', review: { note: 'name from the vaccination card' } });
    expect(f1.email.status).toBe('accepted');
    expect(d1.counts).toMatchObject({ accepted: 1, corrected: 3, confirmed: 1, review: 0, missing: 0, invalid: 0 });

    const d2 = await readDoc(dir, 'intake-0002');
    const f2 = Object.fromEntries(d2.fields.map((f) => [f.name, f]));
    // 30 February does not exist in the Gregorian calendar: the JavaScript calendar rolls it over into March.
    expect(new Date(Date.UTC(2026, 1, 30)).getUTCMonth()).toBe(2);
    expect(f2.visit_date).toMatchObject({ value: null, status: 'invalid' });
    expect(f2.visit_date.review).toBeUndefined();
    // E.164 form as libphonenumber-js (reference library) gives it; 555-0100..0199 is the NANP fictional range.
    const e164 = parsePhoneNumberFromString('(207) 555-0199', 'US')!;
    expect(f2.phone).toMatchObject({ value: e164.number, status: 'corrected', extra: { national: e164.formatNational() } });

    const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
    expect(audit).toHaveLength(6);
    expect(audit.every((e) => e.reviewer === 'R. Quill' && e.at === now.toISOString() && e.queue === path.relative(process.cwd(), queue))).toBe(true); // as given, relative to the working folder
    expect(audit.find((e) => e.document === 'intake-0002' && e.field === 'phone')).toMatchObject({
      action: 'corrected', previousValue: '+12075550142', previousStatus: 'review', value: e164.number, status: 'corrected',
    });

    const summary = JSON.parse(await readFile(path.join(dir, 'summary.json'), 'utf8'));
    const all = await Promise.all(['intake-0001', 'intake-0002', 'intake-0003'].map((id) => readDoc(dir, id)));
    const expected: Record<string, number> = {};
    for (const d of all) for (const f of d.fields) expected[f.status] = (expected[f.status] ?? 0) + 1;
    expect(summary.fields.byStatus).toMatchObject(expected);
    expect(summary.fields.byStatus).toMatchObject({ corrected: 4, confirmed: 2 });
    const lines = (await readFile(path.join(dir, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.map((l) => l.counts)).toEqual(all.map((d) => d.counts));

    // Second apply of the same file: nothing changes on disk.
    const before = await snapshot(dir);
    const again = await applyReviewQueue(queue, dir, { reviewer: 'someone else', now: new Date('2026-03-21T00:00:00Z') });
    expect(again).toMatchObject({ corrected: 0, confirmed: 0, alreadyApplied: 6, documentsWritten: 0, auditRecovered: 0 });
    expect(again.problems).toHaveLength(1);
    expect(await snapshot(dir)).toEqual(before);
  });

  it('refuses rows whose document was extracted again, and reports unknown row ids; applies the rest', async () => {
    const { dir, queue, rows } = await exported(2);
    pick(rows, 'intake-0001', 'phone').confirm = 'yes';
    pick(rows, 'intake-0002', 'phone').confirm = 'yes';
    rows.push({ ...pick(rows, 'intake-0001', 'owner_name'), row_id: 'r00000000deadbeef', correction: 'Robin Quill' });
    await saveAsSpreadsheet(queue, rows);
    // intake-0002 is extracted again after the export: a new run time and a new confidence.
    const file = path.join(dir, 'intake-0002.json');
    const doc = JSON.parse(await readFile(file, 'utf8'));
    doc.createdAt = '2026-03-05T08:00:00.000Z';
    doc.fields[2].confidence = 0.52;
    await writeFile(file, JSON.stringify(doc, null, 2));

    const report = await applyReviewQueue(queue, dir, { reviewer: 'R. Quill' });
    expect(report.confirmed).toBe(1);
    expect(report.problems.map((p) => p.message)).toEqual([
      expect.stringMatching(new RegExp(`intake-0002.*changed since this queue was written.*make a new queue with: formglean review queue --results ${dir}$`)),
      expect.stringMatching(/unknown row id r00000000deadbeef/),
    ]);
    expect((await readDoc(dir, 'intake-0002')).fields[2].status).toBe('review');
  });

  it('refuses a truncated queue whole, with the file and line, and changes nothing', async () => {
    const { dir, queue, rows } = await exported(2);
    for (const r of rows) r.confirm = 'yes';
    rows[rows.length - 1].note = 'seen, ok'; // a comma: the spreadsheet quotes this cell (RFC 4180 §2.6)
    await saveAsSpreadsheet(queue, rows);
    const text = await readFile(queue, 'utf8');
    const cut = text.lastIndexOf('"seen, ok"') + 5; // the file ends inside the quoted cell of the last row
    await writeFile(queue, text.slice(0, cut));
    const before = await snapshot(dir);
    const err = await applyReviewQueue(queue, dir).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(FormgleanError);
    expect((err as Error).message).toMatch(new RegExp(`^${queue.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: line \\d+: .*cut short`));
    expect((err as Error).message).not.toContain('\n');

    // A last row that lost its final cells (no open quote) is refused too.
    const lines = text.trimEnd().split('\r\n');
    lines[lines.length - 1] = lines[lines.length - 1].split(',').slice(-4).join(',');
    await writeFile(queue, lines.join('\r\n') + '\r\n');
    await expect(applyReviewQueue(queue, dir)).rejects.toThrow(new RegExp(`line ${lines.length}: row has a different number of cells`));
    expect((await snapshot(dir)).get('intake-0001.json')).toBe(before.get('intake-0001.json'));
    expect([...(await snapshot(dir)).keys()].filter((k) => k.includes('audit'))).toEqual([]);
  });

  it('takes a correction equal to the value as a confirmation, and "(empty)" on a blank field as confirming it blank', async () => {
    const { dir, queue, rows } = await exported(1);
    // The value as read, typed again in another notation: the same E.164 number (libphonenumber-js, reference library).
    pick(rows, 'intake-0001', 'phone').correction = '(207) 555-0142';
    pick(rows, 'intake-0001', 'pet_name').correction = '(empty)';
    await saveAsSpreadsheet(queue, rows);
    const report = await applyReviewQueue(queue, dir, { reviewer: 'R. Quill' });
    expect(report).toMatchObject({ corrected: 0, confirmed: 2 });
    const f = Object.fromEntries((await readDoc(dir, 'intake-0001')).fields.map((x) => [x.name, x]));
    expect(f.phone).toMatchObject({ value: '+12075550142', status: 'confirmed', extra: { national: '(207) 555-0142' } });
    expect(f.pet_name).toMatchObject({ value: null, status: 'confirmed', review: { previousStatus: 'missing' } });
    const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
    expect(audit.map((e) => [e.field, e.action, e.via])).toEqual([['phone', 'confirmed', 'queue'], ['pet_name', 'confirmed', 'queue']]);
  });
  it('refuses to confirm an invalid field whose text was kept, and takes a correction for it', async () => {
    const { dir, docs } = await makeResultsFolder(1);
    dirs.push(dir);
    // Extract keeps the text read on a field that fails its checks (value and raw), status invalid.
    const doc = docs[0];
    const visit = doc.fields.find((f) => f.name === 'visit_date')!;
    visit.value = '03/1A/2026';
    await writeFile(path.join(dir, 'intake-0001.json'), JSON.stringify(doc, null, 2) + '\n');
    await writeReviewQueue(dir, [doc]);
    const queue = path.join(dir, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Row[];
    pick(rows, 'intake-0001', 'visit_date').confirm = 'yes';
    await saveAsSpreadsheet(queue, rows);
    const report = await applyReviewQueue(queue, dir, { reviewer: 'R. Quill', now: new Date('2026-03-20T09:30:00Z') });
    expect(report.confirmed).toBe(0);
    expect(report.problems.map((p) => p.message)).toEqual([expect.stringMatching(/visit_date.*failed its checks; type a correction/)]);
    expect((await readDoc(dir, 'intake-0001')).fields.find((f) => f.name === 'visit_date')).toMatchObject({ value: '03/1A/2026', status: 'invalid' });

    pick(rows, 'intake-0001', 'visit_date').confirm = '';
    pick(rows, 'intake-0001', 'visit_date').correction = '03/14/2026';
    await saveAsSpreadsheet(queue, rows);
    await applyReviewQueue(queue, dir, { reviewer: 'R. Quill', now: new Date('2026-03-20T09:31:00Z') });
    // ISO 8601-1:2019 calendar date, complete extended format.
    expect((await readDoc(dir, 'intake-0001')).fields.find((f) => f.name === 'visit_date')).toMatchObject({ value: '2026-03-14', status: 'corrected' });
  });
});
