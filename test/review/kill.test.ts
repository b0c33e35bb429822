import { spawn } from 'node:child_process';
import { readdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { DocumentResult } from '../../src/result/document.js';
import { readAudit } from '../../src/review/audit.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { makeResultsFolder } from './results-folder.js';

const repo = path.resolve(import.meta.dirname, '../..');
const cli = path.join(repo, 'src/cli/main.ts');
const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

/** The real CLI in its own node process (node --import tsx, so the pid we kill is the one writing). */
function startCli(args: string[]) {
  const child = spawn(process.execPath, ['--import', 'tsx', cli, ...args], { cwd: repo, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (b: Buffer) => (stdout += b.toString()));
  child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
  const done = new Promise<{ code: number | null; signal: NodeJS.Signals | null; stdout: string; stderr: string }>((resolve) =>
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr })),
  );
  return { child, done };
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function documents(dir: string): Promise<DocumentResult[]> {
  const names = (await readdir(dir)).filter((n) => /^intake-\d+\.json$/.test(n)).sort();
  // JSON.parse + the result contract: a torn file fails here.
  return Promise.all(names.map(async (n) => DocumentResult.parse(JSON.parse(await readFile(path.join(dir, n), 'utf8')))));
}

describe('review apply under a real SIGKILL', () => {
  it('leaves every document JSON whole, and a rerun completes the apply with one audit entry per answer', async () => {
    const count = 400;
    const { dir, docs } = await makeResultsFolder(count, 'fg-review-kill-');
    dirs.push(dir);
    await writeReviewQueue(dir, docs);
    const queue = path.join(dir, 'review', 'queue.csv');
    const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
    for (const r of rows) r.confirm = 'yes';
    await writeFile(queue, stringify(rows, { header: true, bom: true, record_delimiter: '\r\n' }));

    const run = startCli(['review', 'apply', queue, '--results', dir, '--reviewer', 'R. Quill']);
    // Kill as soon as the first document carries an answer: the run is then mid-way through the documents.
    const first = path.join(dir, 'intake-0001.json');
    const deadline = Date.now() + 90_000;
    let exited = false;
    void run.done.then(() => (exited = true));
    while (Date.now() < deadline && !exited) {
      const text = await readFile(first, 'utf8');
      if (text.includes('"status": "confirmed"')) break;
      await sleep(5);
    }
    if (exited) throw new Error(`apply ended before it could be killed: ${(await run.done).stderr}`);
    run.child.kill('SIGKILL');
    const killed = await run.done;
    expect(killed.signal).toBe('SIGKILL');

    const afterKill = await documents(dir);
    expect(afterKill).toHaveLength(count);
    const touched = afterKill.filter((d) => d.fields.some((f) => f.status === 'confirmed')).length;
    expect(touched).toBeGreaterThan(0);
    expect(touched).toBeLessThan(count); // really cut off mid-way

    const rerun = await startCli(['review', 'apply', queue, '--results', dir, '--reviewer', 'R. Quill']).done;
    expect(rerun.stderr).toBe('');
    expect(rerun.code).toBe(0);
    // Documents written before the kill were not yet in the audit log (it is written after the documents).
    expect(rerun.stdout).toMatch(/audit: \d+ entry\(ies\) recovered/);
    const final = await documents(dir);
    expect(final.every((d) => d.fields.every((f) => f.status === 'accepted' || f.status === 'confirmed'))).toBe(true);
    const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
    expect(audit).toHaveLength(rows.length);
    expect(new Set(audit.map((e) => e.rowId)).size).toBe(rows.length);
    const lines = (await readFile(path.join(dir, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.map((l) => l.counts)).toEqual(final.map((d) => d.counts));
    const summary = JSON.parse(await readFile(path.join(dir, 'summary.json'), 'utf8'));
    expect(summary.fields.byStatus.confirmed).toBe(rows.length);
    expect(summary.fields.byStatus.review + summary.fields.byStatus.missing + summary.fields.byStatus.invalid).toBe(0);
  });
});
