import { cp, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DocumentResult } from '../../src/result/document.js';
import { readIndex } from '../../src/results/index-read.js';
import { REPO, runCli, startCli } from '../cli/run-cli.js';

/**
 * Finding: a results folder's index was emptied at the start of every run, so a run killed early, a configuration
 * error at the first document, or a damaged last line of results.jsonl reverted every review answer. Real extract
 * and review apply processes, real detector and OCR.
 */
const SCHEMA = path.join(REPO, 'schemas/clinic-intake.yaml');
let work: string;
let scans: string;
let out: string;
let answeredQueue: string;
let answers: number;

async function docs(dir: string): Promise<DocumentResult[]> {
  const index = await readIndex(dir, () => undefined);
  return Promise.all(
    index.lines.filter((l) => l.ok).map(async (l) => DocumentResult.parse(JSON.parse(await readFile(path.join(dir, l.json!), 'utf8')))),
  );
}

function reviewed(all: readonly DocumentResult[]): number {
  return all.reduce((n, d) => n + d.counts.confirmed + d.counts.corrected, 0);
}

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-index-safety-'));
  scans = path.join(work, 'scans');
  out = path.join(work, 'out');
  await mkdir(scans);
  // Two scans of the same invented clinic form page, stored with different PNG settings (other bytes, same pixels).
  const page = path.join(REPO, 'samples/clinic-intake-typed.png');
  await sharp(page).png({ compressionLevel: 9 }).toFile(path.join(scans, 'b-intake.png'));
  await sharp(page).png({ compressionLevel: 6 }).toFile(path.join(scans, 'c-intake.png'));
  const first = await runCli(['extract', scans, '--schema', SCHEMA, '--out', out]);
  expect(first.code).toBe(0);
  // The clerk answers every row: confirms all, corrects nothing (values need not be right for this test).
  const queue = path.join(out, 'review', 'queue.csv');
  const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
  for (const r of rows) r.confirm = 'yes';
  answers = rows.length;
  expect(answers).toBeGreaterThan(0);
  answeredQueue = path.join(work, 'answered.csv');
  await writeFile(answeredQueue, stringify(rows, { header: true, bom: true, record_delimiter: '\r\n' }));
  const applied = await runCli(['review', 'apply', answeredQueue, '--results', out, '--reviewer', 'R. Quill']);
  expect(applied.code).toBe(0);
  expect(reviewed(await docs(out))).toBe(answers);
}, 240_000);

describe('the results index is never emptied before the new one is complete', () => {
  it('(a) a run killed mid-way keeps every answer; the rerun lists other inputs too and the queue still applies', async () => {
    const extra = path.join(work, 'a-new.png');
    await sharp(path.join(REPO, 'samples/clinic-intake-typed.png')).png({ compressionLevel: 1 }).toFile(extra);
    const crops = path.join(out, 'review', 'crops');
    const before = new Set(await readdir(crops));
    const run = startCli(['extract', extra, '--schema', SCHEMA, '--out', out, '--resume']);
    // Killed the moment the new scan's first review crop is on disk: its record and index line are not written yet.
    let exited = false;
    void run.done.then(() => (exited = true));
    while (!exited && !(await readdir(crops)).some((n) => !before.has(n) && n.endsWith('.png'))) await new Promise((r) => setTimeout(r, 10));
    expect(exited).toBe(false);
    run.child.kill('SIGKILL');
    expect((await run.done).signal).toBe('SIGKILL');
    const afterKill = await docs(out);
    expect(afterKill.map((d) => d.document.id).sort()).toEqual(['b-intake', 'c-intake']);
    expect(reviewed(afterKill)).toBe(answers);

    const rerun = await runCli(['extract', extra, '--schema', SCHEMA, '--out', out, '--resume']);
    expect(rerun.code).toBe(0);
    const all = await docs(out);
    // Records of inputs not in this run stay listed, with their answers.
    expect(all.map((d) => d.document.id).sort()).toEqual(['a-new', 'b-intake', 'c-intake']);
    expect(reviewed(all)).toBe(answers);
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.documents).toEqual({ total: 3, processed: 3, failed: 0 });
    const again = await runCli(['review', 'apply', answeredQueue, '--results', out, '--reviewer', 'R. Quill']);
    expect(again.code).toBe(0);
    expect(again.stdout).toContain(`applied 0 answer(s) to 0 document(s): 0 corrected, 0 confirmed; ${answers} already applied`);

    // Extracting the unchanged scans again without --resume carries the answers over to the new readings.
    const fresh = await runCli(['extract', scans, '--schema', SCHEMA, '--out', out]);
    expect(fresh.code).toBe(0);
    expect(fresh.stderr).not.toContain('unchanged, kept');
    expect(reviewed(await docs(out))).toBe(answers);
  }, 240_000);

  it('(b) a configuration error found before the first document leaves the folder as it was (exit 2, one line)', async () => {
    const copy = path.join(work, 'out-b');
    await cp(out, copy, { recursive: true });
    const before = await readFile(path.join(copy, 'results.jsonl'), 'utf8');
    // The schema loads, but the blank reference image it names is cut short.
    const broken = path.join(work, 'broken-schema');
    await mkdir(broken);
    await writeFile(path.join(broken, 'clinic-intake.yaml'), await readFile(SCHEMA));
    const blank = await readFile(path.join(REPO, 'schemas/clinic-intake.blank.png'));
    await writeFile(path.join(broken, 'clinic-intake.blank.png'), blank.subarray(0, blank.length / 3));
    const run = await runCli(['extract', scans, '--schema', path.join(broken, 'clinic-intake.yaml'), '--out', copy]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/^formglean: [^\n]*clinic-intake\.yaml: pages\[0\]\.image: [^\n]*\n$/);
    expect(await readFile(path.join(copy, 'results.jsonl'), 'utf8')).toBe(before);
  }, 120_000);

  it('(c) a damaged last line of results.jsonl is reported and the records are kept, answers and all', async () => {
    const copy = path.join(work, 'out-c');
    await cp(out, copy, { recursive: true });
    const file = path.join(copy, 'results.jsonl');
    const text = await readFile(file, 'utf8');
    await writeFile(file, text.slice(0, text.length - 30));
    const run = await runCli(['extract', scans, '--schema', SCHEMA, '--out', copy, '--resume']);
    expect(run.code).toBe(0);
    expect(run.stderr).toMatch(/warning: [^\n]*results\.jsonl: 1 damaged line\(s\) dropped; 1 document record\(s\) found in the folder listed again\n/);
    expect(run.stderr.match(/unchanged, kept/g)).toHaveLength(2);
    expect(reviewed(await docs(copy))).toBe(answers);
  }, 120_000);
});
