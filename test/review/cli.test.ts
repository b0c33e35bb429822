import { execFile } from 'node:child_process';
import { readFile, rm, writeFile } from 'node:fs/promises';
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
});
