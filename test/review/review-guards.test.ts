import { spawn } from 'node:child_process';
import { readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { DocumentResult } from '../../src/result/document.js';
import { applyReviewQueue } from '../../src/review/apply.js';
import { readAudit } from '../../src/review/audit.js';
import { recordsCsv, recordTable } from '../../src/review/export-table.js';
import { guardCell, looksLikeFormula, unguardCell } from '../../src/review/formula-guard.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { documentResult, field } from './fixture.js';
import { makeResultsFolder } from './results-folder.js';

const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

type Row = Record<string, string>;

async function answeredFolder(count: number) {
  const { dir, docs } = await makeResultsFolder(count, 'fg-guards-');
  dirs.push(dir);
  await writeReviewQueue(dir, docs);
  const queue = path.join(dir, 'review', 'queue.csv');
  const rows = parse(await readFile(queue), { bom: true, columns: true }) as Row[];
  return { dir, docs, queue, rows };
}

async function save(queue: string, rows: Row[]): Promise<void> {
  await writeFile(queue, stringify(rows, { header: true, bom: true, record_delimiter: '\r\n', quoted: true }));
}

describe('formula guard (OWASP "CSV Injection": leading whitespace and invisible characters must not hide a formula)', () => {
  it('guards a trigger after a leading space, LF, no-break space, BOM or zero-width space, and reverses exactly', () => {
    for (const cell of [' =1+1', '\n=HYPERLINK("http://example.org")', '\u00A0+1', '\uFEFF=1', '\u200B@SUM(A1)', '  \t-2', '\n']) {
      expect(looksLikeFormula(cell)).toBe(true);
      expect(guardCell(cell)).toBe(`'${cell}`);
      expect(unguardCell(guardCell(cell))).toBe(cell);
    }
    for (const cell of [' Robin', "' =1", "'", '', 'Quill - Robin', '\u200BQuill']) expect(unguardCell(guardCell(cell))).toBe(cell);
    expect(guardCell(' Robin')).toBe(' Robin');
  });
});

describe('export CSV', () => {
  it('quotes every cell holding a lone LF or CR, so a newline in a file name does not split the row (RFC 4180 §2.6)', () => {
    const doc = documentResult('scan', [field('owner_name', 'text', 'Robin\rQuill', 'accepted')]);
    doc.document.path = '/scans/evil\nname.png';
    const text = recordsCsv(recordTable([doc]), { formulaGuard: true, bom: false });
    // Read back by a strict RFC 4180 reader (csv-parse): one header, one record, every column in place.
    const rows = parse(text, { columns: true }) as Row[];
    expect(rows).toHaveLength(1);
    expect(rows[0]['document.path']).toBe('/scans/evil\nname.png');
    expect(rows[0].owner_name).toBe('Robin\rQuill');
    expect(rows[0]['review.pending']).toBe('0');
  });
});

describe('review apply refuses unusable answers', () => {
  it('refuses a 5 000 000-character correction and a NUL byte, by line, and applies the other rows', async () => {
    const { dir, queue, rows } = await answeredFolder(2);
    const names = rows.filter((r) => r.type === 'text');
    names[0].correction = 'x'.repeat(5_000_000);
    names[1].correction = 'Robin\u0000Quill';
    const phone = rows.find((r) => r.type === 'phone')!;
    phone.confirm = 'yes';
    await save(queue, rows);
    const report = await applyReviewQueue(queue, dir, { reviewer: 'R. Quill', now: new Date('2026-03-05T09:00:00Z') });
    expect(report.confirmed).toBe(1);
    expect(report.corrected).toBe(0);
    expect(report.problems.map((p) => p.message)).toEqual([
      'correction is 5000000 characters long, over the 1000-character limit; not applied',
      'correction holds a control character (U+0000); not applied',
    ]);
    const stored = await readFile(path.join(dir, `${names[0].document}.json`), 'utf8');
    expect(stored.length).toBeLessThan(100_000);
    expect(stored).not.toContain('\\u0000');
  });
});

/** The real CLI in its own process. */
function cli(args: string[]) {
  const child = spawn(process.execPath, ['--import', 'tsx', path.resolve(import.meta.dirname, '../../src/cli/main.ts'), ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (b: Buffer) => (stdout += b.toString()));
  child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
  return new Promise<{ code: number | null; stdout: string; stderr: string }>((resolve) => child.on('close', (code) => resolve({ code, stdout, stderr })));
}

describe('the apply lock', () => {
  it('is never taken from an owner it cannot identify: an empty lock file (an apply between creating and filling it) stops a second apply', async () => {
    const { dir, queue, rows } = await answeredFolder(2);
    for (const r of rows) r.confirm = 'yes';
    await save(queue, rows);
    const lock = path.join(dir, 'review', '.apply.lock');
    await writeFile(lock, '');
    await expect(applyReviewQueue(queue, dir, { reviewer: 'R' })).rejects.toThrow(
      `${lock}: lock file is not a formglean lock record; if no review apply is running on this folder, delete it`,
    );
    // Nothing was written: the owner's work cannot be overwritten.
    const doc = DocumentResult.parse(JSON.parse(await readFile(path.join(dir, 'intake-0001.json'), 'utf8')));
    expect(doc.fields.some((f) => f.status === 'confirmed')).toBe(false);
  });

  it('stops a second apply while the owner lives, and takes over the lock of an owner that has ended', async () => {
    const { dir, queue, rows } = await answeredFolder(2);
    for (const r of rows) r.confirm = 'yes';
    await save(queue, rows);
    const lock = path.join(dir, 'review', '.apply.lock');
    const owner = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 20000)']);
    try {
      await writeFile(lock, JSON.stringify({ pid: owner.pid, host: (await import('node:os')).hostname(), token: 'abc' }));
      await expect(applyReviewQueue(queue, dir, { reviewer: 'R' })).rejects.toThrow(`another review apply (pid ${owner.pid}) is running`);
    } finally {
      owner.kill('SIGKILL');
      await new Promise((r) => owner.on('close', r));
    }
    const report = await applyReviewQueue(queue, dir, { reviewer: 'R' });
    expect(report.confirmed).toBe(rows.length);
  });

  it('admits one of two applies started together on one folder; no answer is lost', async () => {
    const { dir, queue, rows } = await answeredFolder(150);
    for (const r of rows) r.confirm = 'yes';
    await save(queue, rows);
    const [a, b] = await Promise.all([0, 1].map(() => cli(['review', 'apply', queue, '--results', dir, '--reviewer', 'R. Quill'])));
    const codes = [a.code, b.code].sort();
    // Either one waits out the other's lock (exit 2, one line naming the lock) or they ran one after the other.
    if (codes[1] === 2) expect([a, b].find((r) => r.code === 2)!.stderr).toMatch(/^formglean: .*\.apply\.lock: another review apply \(pid \d+\) is running on this results folder\n$/);
    else expect(codes).toEqual([0, 0]);
    const rerun = await cli(['review', 'apply', queue, '--results', dir, '--reviewer', 'R. Quill']);
    expect(rerun.code).toBe(0);
    const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
    expect(new Set(audit.map((e) => e.rowId)).size).toBe(rows.length);
    expect(audit).toHaveLength(rows.length);
  });
});
