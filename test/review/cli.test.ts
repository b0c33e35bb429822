import { execFile } from 'node:child_process';
import { readdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { promisify } from 'node:util';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { makeResultsFolder } from './results-folder.js';

const repo = path.resolve(import.meta.dirname, '../..');
const run = async (args: string[]) => {
  try {
    const r = await promisify(execFile)(process.execPath, ['--import', 'tsx', path.join(repo, 'src/cli/main.ts'), ...args], { cwd: repo });
    return { code: 0, ...r };
  } catch (err) {
    const e = err as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
};
const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

describe('review and export commands', () => {
  it('apply reports refused rows by file and line with exit code 1; status and export read the result', async () => {
    const { dir, docs } = await makeResultsFolder(2, 'fg-review-cli-');
    dirs.push(dir);
    await writeReviewQueue(dir, docs);
    const queue = path.join(dir, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    rows[0].confirm = 'yes';
    rows[1].correction = '13/45/2026'; // visit_date: month 13 does not exist (ISO 8601 months are 01-12)
    await writeFile(queue, stringify(rows, { header: true }));

    const applied = await run(['review', 'apply', queue, '--results', dir, '--reviewer', 'R. Quill']);
    expect(applied.stderr + applied.stdout).toContain("confirmed");
    expect(applied.code).toBe(1);
    expect(applied.stdout).toContain('1 confirmed');
    expect(applied.stderr).toContain(`${queue}:3: correction for field "visit_date" is not a valid date`);
    expect(applied.stderr).not.toContain('13/45'); // no field values in logs

    const status = await run(['review', 'status', '--results', dir, '--json']);
    expect(status.code).toBe(0);
    expect(JSON.parse(status.stdout).total).toEqual({ pending: rows.length - 1, corrected: 0, confirmed: 1 });

    const out = path.join(dir, 'records.jsonl');
    const exported = await run(['export', '--results', dir, '--format', 'jsonl', '--out', out]);
    expect(exported.code).toBe(0);
    const records = (await readFile(out, 'utf8')).trimEnd().split('\n').map((l) => JSON.parse(l));
    expect(records.map((r) => r['document.id'])).toEqual(['intake-0001', 'intake-0002']);
    expect(records[1].email).toBe('owner0002@example.org');

    const usage = await run(['export', '--results', dir, '--format', 'xml']);
    expect(usage.code).toBe(2);
  });

  it('review queue writes a fresh queue after a re-extraction, named by the refusal; status groups by layout; export splits layouts', async () => {
    const { dir, docs } = await makeResultsFolder(2, 'fg-review-cli-');
    dirs.push(dir);
    await writeReviewQueue(dir, docs);
    const queue = path.join(dir, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    const phone = rows.find((r) => r.document === 'intake-0002' && r.field === 'phone')!;
    phone.confirm = 'yes';
    await writeFile(queue, stringify(rows, { header: true }));
    // intake-0002 is extracted again (another run time), and becomes a marina-slip form for the layout split below.
    const file = path.join(dir, 'intake-0002.json');
    const doc = JSON.parse(await readFile(file, 'utf8'));
    doc.createdAt = '2026-03-05T08:00:00.000Z';
    doc.schema.name = 'marina-slip';
    await writeFile(file, JSON.stringify(doc, null, 2));

    const stale = await run(['review', 'apply', queue, '--results', dir]);
    expect(stale.code).toBe(1);
    const command = `formglean review queue --results ${dir}`;
    expect(stale.stderr).toContain(`make a new queue with: ${command}`);
    const fresh = await run(command.split(' ').slice(1));
    expect(fresh.code).toBe(0);
    const again = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    const newPhone = again.find((r) => r.document === 'intake-0002' && r.field === 'phone')!;
    expect(newPhone.result_hash).not.toBe(phone.result_hash);
    expect(newPhone.confirm).toBe(''); // an answer given for the old reading is not carried onto the new one
    // The old queue with its typed answer is kept beside it.
    expect((await readdir(path.join(dir, 'review'))).some((n) => /^queue\..+\.csv$/.test(n))).toBe(true);

    const status = await run(['review', 'status', '--results', dir]);
    expect(status.stdout).toMatch(/layout clinic-intake: 1 document\(s\)/);
    expect(status.stdout).toMatch(/layout marina-slip: 1 document\(s\)/);
    expect(status.stdout).not.toMatch(/^email /m); // accepted everywhere: not listed

    const usage = await run(['export', '--results', dir]);
    expect(usage.code).toBe(2);
    expect(usage.stderr).toContain('2 layouts (clinic-intake, marina-slip)');
    const out = path.join(dir, 'records.csv');
    expect((await run(['export', '--results', dir, '--out', out])).code).toBe(0);
    const clinic = parse(await readFile(path.join(dir, 'records.clinic-intake.csv')), { columns: true }) as Record<string, string>[];
    const marina = parse(await readFile(path.join(dir, 'records.marina-slip.csv')), { columns: true }) as Record<string, string>[];
    expect([clinic.map((r) => r['document.id']), marina.map((r) => r['document.id'])]).toEqual([['intake-0001'], ['intake-0002']]);
    const one = await run(['export', '--results', dir, '--schema', 'marina-slip', '--format', 'jsonl']);
    expect(one.stdout.trim().split('\n').map((l) => JSON.parse(l)['document.id'])).toEqual(['intake-0002']);

    const help = await run(['review', '--help']);
    expect(help.stdout).toContain('below_review_threshold');
    expect(help.stdout).toContain('serve');
  });
});
