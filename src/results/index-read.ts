import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { DocumentResult } from '../result/document.js';
import { indexSha256 } from './index-write.js';
import { JOURNAL_FILE, RESULTS_FILE, SUMMARY_FILE } from './layout.js';
import { okLine, ResultsLine } from './results-line.js';

export interface ResultsIndex {
  lines: ResultsLine[];
  /** results.jsonl was absent (a fresh folder, or one whose index was lost). */
  missing: boolean;
  /** The index was rebuilt (from the record files) or extended (from the journal): it should be written again. */
  needsWrite: boolean;
  /** No results.jsonl, no journal and no document record: not a results folder (yet). */
  empty: boolean;
}

/** Warnings name the folder's files and counts, never a field value. */
export type Warn = (message: string) => void;

export const warnOnStderr: Warn = (message) => process.stderr.write(`warning: ${message}\n`);

const JournalLine = z.object({ path: z.string(), lines: z.array(ResultsLine) });

async function readText(file: string): Promise<string | null> {
  try {
    return await readFile(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
}

function parseLine<T>(schema: z.ZodType<T>, text: string): T | null {
  try {
    const parsed = schema.safeParse(JSON.parse(text));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

/** Document records (DIR/<id>.json that read as a formglean result) as index lines. */
async function recordLines(dir: string): Promise<ResultsLine[]> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return [];
  }
  const lines: ResultsLine[] = [];
  for (const name of names.filter((n) => n.endsWith('.json') && n !== SUMMARY_FILE && !n.startsWith('.')).sort()) {
    const text = await readText(path.join(dir, name)).catch(() => null);
    const result = text === null ? null : parseLine(DocumentResult, text);
    if (result) lines.push({ ...okLine(result), json: name });
  }
  return lines;
}

function byPathThenId(a: ResultsLine, b: ResultsLine): number {
  return a.path < b.path ? -1 : a.path > b.path ? 1 : a.document < b.document ? -1 : a.document > b.document ? 1 : 0;
}

/** Lines of `next` replace every line of the same input in `base`; other inputs stay listed. */
export function mergeLines(base: readonly ResultsLine[], next: readonly ResultsLine[]): ResultsLine[] {
  const replaced = new Set(next.map((l) => l.path));
  return [...base.filter((l) => !replaced.has(l.path)), ...next].sort(byPathThenId);
}

/**
 * The index of a results folder as the last run left it: results.jsonl, with the journal of a run that was cut off
 * replayed on top. When results.jsonl is missing while records exist, or has a damaged line, the good lines are kept
 * and every document record on disk that they do not list is added back, with a warning.
 */
export async function readIndex(dir: string, warn: Warn = warnOnStderr): Promise<ResultsIndex> {
  const indexFile = path.join(dir, RESULTS_FILE);
  const text = await readText(indexFile);
  const journalText = await readText(path.join(dir, JOURNAL_FILE));
  let lines: ResultsLine[] = [];
  let damaged = 0;
  for (const raw of (text ?? '').split('\n')) {
    if (raw.trim() === '') continue;
    const line = parseLine(ResultsLine, raw);
    if (line) lines.push(line);
    else damaged++;
  }
  let needsWrite = false;
  const records = text === null || damaged > 0 ? await recordLines(dir) : [];
  if (text === null && records.length === 0 && journalText === null) return { lines: [], missing: true, needsWrite: false, empty: true };
  if (text === null || damaged > 0) {
    const listed = new Set(lines.filter((l) => l.json).map((l) => l.json));
    const added = records.filter((r) => !listed.has(r.json));
    lines = mergeLines([], [...lines, ...added]);
    needsWrite = true;
    warn(
      text === null
        ? `${indexFile}: missing; rebuilt the index from ${added.length} document record(s) in the folder`
        : `${indexFile}: ${damaged} damaged line(s) dropped; ${added.length} document record(s) found in the folder listed again`,
    );
  }
  if (journalText !== null) {
    for (const raw of journalText.split('\n')) {
      // A torn last line is what a run killed mid-append leaves: that input is simply done again.
      const entry = raw.trim() === '' ? null : parseLine(JournalLine, raw);
      if (entry) lines = mergeLines(lines, entry.lines.length ? entry.lines : []);
    }
    needsWrite = true;
  }
  if (!needsWrite && text !== null) needsWrite = !(await summaryMatches(dir, text));
  return { lines, missing: text === null, needsWrite, empty: false };
}

/** Whether summary.json was written from this very index (a run cut off between the two writes leaves it behind). */
async function summaryMatches(dir: string, indexTextNow: string): Promise<boolean> {
  const summary = await readText(path.join(dir, SUMMARY_FILE)).catch(() => null);
  if (summary === null) return false;
  const recorded = parseLine(z.object({ index: z.object({ sha256: z.string() }) }), summary);
  // A summary from before the hash was recorded is trusted as it is.
  if (recorded === null) return parseLine(z.object({ documents: z.unknown() }), summary) !== null;
  return recorded.index.sha256 === indexSha256(indexTextNow);
}
