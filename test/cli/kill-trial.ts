import { cp, mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import sharp from 'sharp';
import { DocumentResult } from '../../src/result/document.js';
import { readAudit } from '../../src/review/audit.js';
import { writeReviewQueue } from '../../src/review/queue-write.js';
import { readIndex } from '../../src/results/index-read.js';
import { makeResultsFolder } from '../review/results-folder.js';
import { REPO, runCli, startCli } from './run-cli.js';

/**
 * SIGKILL trials shared by test/cli/kill-trials.test.ts (a few random points) and bench/kill-trials.ts (many):
 * a real extract or review apply process is killed at a random moment, the same command is run again, and the
 * folder must then hold the same values as an uninterrupted run, no temp file, and every review answer.
 */
export const KILL_SCHEMA = path.join(REPO, 'schemas/clinic-intake.yaml');
const PAGE = path.join(REPO, 'samples/clinic-intake-typed.png');

type Values = Record<string, [string, unknown, string][]>;

export interface TrialOutcome {
  kind: 'extract' | 'extract --resume' | 'review apply';
  killAfterMs: number;
  /** The process was still running when the signal came (a kill after the end proves nothing). */
  killedMidway: boolean;
  rerunCode: number | null;
  identical: boolean;
  orphans: string[];
  answers: number;
  lostAnswers: number;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Start a command, SIGKILL it `ms` after it starts (or after `started` holds), and say whether it still ran then. */
async function killAfter(args: readonly string[], ms: number, started?: () => Promise<boolean>): Promise<boolean> {
  const run = startCli(args);
  let exited = false;
  void run.done.then(() => (exited = true));
  while (started && !exited && !(await started())) await sleep(5);
  await sleep(ms);
  const midway = !exited;
  run.child.kill('SIGKILL');
  await run.done;
  return midway;
}

async function valuesOf(dir: string): Promise<Values> {
  const index = await readIndex(dir, () => undefined);
  const out: Values = {};
  for (const l of index.lines.filter((x) => x.ok && x.json)) {
    const d = DocumentResult.parse(JSON.parse(await readFile(path.join(dir, l.json!), 'utf8')));
    out[d.document.id] = d.fields.map((f) => [f.name, f.value, f.status]);
  }
  return out;
}

function sortedKeys(values: Values): Values {
  return Object.fromEntries(Object.entries(values).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
}

function reviewedCount(values: Values): number {
  return Object.values(values).reduce((n, fs) => n + fs.filter(([, , s]) => s === 'corrected' || s === 'confirmed').length, 0);
}

/** Temp files anywhere under the folder: a finished run must leave none (src/results/temp-files.ts). */
async function orphansIn(dir: string): Promise<string[]> {
  const entries = await readdir(dir, { recursive: true });
  return entries.filter((n) => n.endsWith('.tmp') || path.basename(n) === 'results.journal.jsonl' || path.basename(n) === '.apply.lock');
}

export interface ExtractFixture {
  scans: string;
  extra: string;
  /** A results folder of the two scans with every review row confirmed. */
  answered: string;
  answers: number;
  /** Values after review (the two scans), and the plain reading of the extra scan. */
  expectedAnswered: Values;
  expectedExtra: [string, unknown, string][];
  /** Wall time of the first extract, to spread kill points over. */
  extractMs: number;
}

/** Two scans (same invented page, different bytes) extracted and fully reviewed, and a third scan not yet read. */
export async function extractFixture(work: string): Promise<ExtractFixture> {
  const scans = path.join(work, 'scans');
  const answered = path.join(work, 'answered');
  await mkdir(scans, { recursive: true });
  await sharp(PAGE).png({ compressionLevel: 9 }).toFile(path.join(scans, 'b-intake.png'));
  await sharp(PAGE).png({ compressionLevel: 6 }).toFile(path.join(scans, 'c-intake.png'));
  const extra = path.join(work, 'a-new.png');
  await sharp(PAGE).png({ compressionLevel: 1 }).toFile(extra);
  const started = Date.now();
  const first = await runCli(['extract', scans, '--schema', KILL_SCHEMA, '--out', answered]);
  const extractMs = Date.now() - started;
  if (first.code !== 0) throw new Error(`fixture extract failed: ${first.stderr}`);
  const reading = await valuesOf(answered);
  const queue = path.join(answered, 'review', 'queue.csv');
  const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
  for (const r of rows) r.confirm = 'yes';
  const answeredQueue = path.join(work, 'answered.csv');
  await writeFile(answeredQueue, stringify(rows, { header: true, bom: true, record_delimiter: '\r\n' }));
  const applied = await runCli(['review', 'apply', answeredQueue, '--results', answered, '--reviewer', 'R. Quill']);
  if (applied.code !== 0) throw new Error(`fixture apply failed: ${applied.stderr}`);
  // The extra scan has the same pixels as b-intake: its reading is b-intake's reading before review.
  return { scans, extra, answered, answers: rows.length, expectedAnswered: await valuesOf(answered), expectedExtra: reading['b-intake'], extractMs };
}

/**
 * Kill an extract over a reviewed folder: either extracting the two scans again (answers carried over) or, with
 * --resume, adding the third scan. Then run the same command with --resume to completion and compare.
 */
export async function extractKillTrial(fx: ExtractFixture, dir: string, killAfterMs: number, resume: boolean): Promise<TrialOutcome> {
  await rm(dir, { recursive: true, force: true });
  await cp(fx.answered, dir, { recursive: true });
  const inputs = resume ? [fx.scans, fx.extra] : [fx.scans];
  const killedMidway = await killAfter(['extract', ...inputs, '--schema', KILL_SCHEMA, '--out', dir, ...(resume ? ['--resume'] : [])], killAfterMs);
  const rerun = await runCli(['extract', ...inputs, '--schema', KILL_SCHEMA, '--out', dir, '--resume']);
  const values = await valuesOf(dir);
  const expected: Values = { ...fx.expectedAnswered, ...(resume ? { 'a-new': fx.expectedExtra } : {}) };
  return {
    kind: resume ? 'extract --resume' : 'extract',
    killAfterMs,
    killedMidway,
    rerunCode: rerun.code,
    identical: JSON.stringify(sortedKeys(values)) === JSON.stringify(sortedKeys(expected)),
    orphans: await orphansIn(dir),
    answers: fx.answers,
    lostAnswers: fx.answers - reviewedCount(values),
  };
}

/**
 * Kill a review apply of a fully answered queue (confirmations and corrections) and apply it again. The kill comes
 * `killAfterMs` after the first document carries an answer, so that it falls among the writes (documents, audit
 * log, index) rather than during the process's start.
 */
export async function applyKillTrial(documents: number, killAfterMs: number): Promise<TrialOutcome & { dir: string }> {
  const { dir, docs } = await makeResultsFolder(documents, 'fg-kill-apply-');
  await writeReviewQueue(dir, docs);
  const queue = path.join(dir, 'review', 'queue.csv');
  const rows = parse(await readFile(queue), { bom: true, columns: true }) as Record<string, string>[];
  const expected = new Map<string, [unknown, string]>();
  for (const r of rows) {
    if (r.field === 'owner_name') {
      r.correction = 'Robin Quill';
      expected.set(r.row_id, ['Robin Quill', 'corrected']);
    } else {
      r.confirm = 'yes';
      expected.set(r.row_id, [null, 'confirmed']);
    }
  }
  await writeFile(queue, stringify(rows, { header: true, bom: true, record_delimiter: '\r\n' }));
  const args = ['review', 'apply', queue, '--results', dir, '--reviewer', 'R. Quill'];
  const first = path.join(dir, `${rows[0].document}.json`);
  const killedMidway = await killAfter(args, killAfterMs, async () => /"status": "(confirmed|corrected)"/.test(await readFile(first, 'utf8')));
  const rerun = await runCli(args);
  const audit = await readAudit(path.join(dir, 'review', 'audit.jsonl'));
  const byId = new Map(rows.map((r) => [r.row_id, r]));
  let lost = 0;
  for (const [rowId, [value, status]] of expected) {
    const row = byId.get(rowId)!;
    const doc = DocumentResult.parse(JSON.parse(await readFile(path.join(dir, `${row.document}.json`), 'utf8')));
    const f = doc.fields.find((x) => x.name === row.field)!;
    const inAudit = audit.filter((e) => e.rowId === rowId).length === 1;
    if (f.status !== status || (value !== null && f.value !== value) || !inAudit) lost++;
  }
  // The index agrees with the records it lists.
  const index = await readIndex(dir, () => undefined);
  let countsMatch = index.lines.length === docs.length;
  for (const l of index.lines) {
    const d = DocumentResult.parse(JSON.parse(await readFile(path.join(dir, l.json!), 'utf8')));
    if (JSON.stringify(d.counts) !== JSON.stringify(l.counts)) countsMatch = false;
  }
  return {
    kind: 'review apply',
    killAfterMs,
    killedMidway,
    rerunCode: rerun.code,
    identical: countsMatch && audit.length === expected.size,
    orphans: await orphansIn(dir),
    answers: expected.size,
    lostAnswers: lost,
    dir,
  };
}
