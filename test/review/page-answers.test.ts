import { readFile, rm } from 'node:fs/promises';
import path from 'node:path';
import { parsePhoneNumberFromString } from 'libphonenumber-js/max';
import { afterAll, describe, expect, it } from 'vitest';
import { DocumentResult } from '../../src/result/document.js';
import { readAudit } from '../../src/review/audit.js';
import { startReviewPage } from '../../src/review/page/server.js';
import type { PageView } from '../../src/review/page/view.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { makeResultsFolder } from './results-folder.js';

const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

async function readDoc(dir: string, id: string): Promise<DocumentResult> {
  return DocumentResult.parse(JSON.parse(await readFile(path.join(dir, `${id}.json`), 'utf8')));
}

describe('review page answers (HTTP, no browser)', () => {
  it('applies answers through the review apply path: checks, record, audit; refuses a bad one with the formats', async () => {
    const { dir, docs } = await makeResultsFolder(2, 'fg-page-');
    dirs.push(dir);
    await writeReviewQueue(dir, docs);
    const page = await startReviewPage({ resultsDir: dir, reviewer: 'R. Quill', now: () => new Date('2026-03-20T09:30:00Z') });
    try {
      const view = (await (await fetch(`${page.url}api/rows`)).json()) as PageView;
      expect(view.rows).toHaveLength(8);
      const row = (doc: string, field: string) => view.rows.find((r) => r.document === doc && r.field === field)!;
      const date = row('intake-0001', 'visit_date');
      expect(date.accepts).toBe('a date as MM/DD/YYYY or YYYY-MM-DD');
      expect(date.reasons[0]).toMatchObject({ code: 'invalid_date' });
      const post = (body: unknown) =>
        fetch(`${page.url}api/answer`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify(body) });

      // 30 February does not exist in the Gregorian calendar.
      const before = await readFile(path.join(dir, 'intake-0001.json'), 'utf8');
      const bad = await post({ rowId: date.rowId, action: 'correct', text: '02/30/2026' });
      expect(bad.status).toBe(422);
      expect((await bad.json()).message).toMatch(/not a valid date \(invalid_date\); the field accepts a date as MM\/DD\/YYYY or YYYY-MM-DD/);
      expect(await readFile(path.join(dir, 'intake-0001.json'), 'utf8')).toBe(before);
      expect(await readAudit(path.join(dir, 'review', 'audit.jsonl'))).toEqual([]);

      const good = await post({ rowId: date.rowId, action: 'correct', text: '03/14/2026', note: 'from the card' });
      expect(good.status).toBe(200);
      expect((await good.json()).row.now).toMatchObject({ status: 'corrected', value: '2026-03-14', reviewer: 'R. Quill', note: 'from the card' });
      // E.164 as libphonenumber-js (reference library) gives it: typing the value as read confirms it.
      const phone = row('intake-0002', 'phone');
      expect(parsePhoneNumberFromString('(207) 555-0142', 'US')!.number).toBe(phone.value);
      expect((await (await post({ rowId: phone.rowId, action: 'correct', text: '(207) 555-0142' })).json()).message).toBe('confirmed');
      expect((await (await post({ rowId: row('intake-0002', 'pet_name').rowId, action: 'blank' })).json()).message).toBe('confirmed');
      // Undo the date: back to what extraction read.
      expect((await (await post({ rowId: date.rowId, action: 'revert' })).json()).message).toBe('undone');
      expect((await post({ rowId: date.rowId, action: 'revert' })).status).toBe(422); // nothing left to undo

      const d1 = await readDoc(dir, 'intake-0001');
      expect(d1.fields.find((f) => f.name === 'visit_date')).toMatchObject({ status: 'invalid', value: null });
      expect(d1.fields.find((f) => f.name === 'visit_date')!.review).toBeUndefined();
      const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
      expect(audit.map((e) => [e.document, e.field, e.action])).toEqual([
        ['intake-0001', 'visit_date', 'corrected'],
        ['intake-0002', 'phone', 'confirmed'],
        ['intake-0002', 'pet_name', 'confirmed'],
        ['intake-0001', 'visit_date', 'reverted'],
      ]);
      expect(audit.every((e) => e.via === 'page' && e.line === view.rows.find((r) => r.rowId === e.rowId)!.line + 0)).toBe(true);
      const summary = JSON.parse(await readFile(path.join(dir, 'summary.json'), 'utf8'));
      expect(summary.fields.byStatus).toMatchObject({ confirmed: 2, corrected: 0 });

      // Malformed requests are refused before anything is read.
      expect((await post({ rowId: 'not-a-row', action: 'confirm' })).status).toBe(400);
      expect((await fetch(`${page.url}api/answer`, { method: 'POST', body: '{}' })).status).toBe(415);
    } finally {
      await page.close();
    }
  });
});
