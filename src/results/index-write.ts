import { createHash } from 'node:crypto';
import { open, rm } from 'node:fs/promises';
import path from 'node:path';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import { JOURNAL_FILE, RESULTS_FILE, SUMMARY_FILE } from './layout.js';
import type { ResultsLine } from './results-line.js';
import type { RunRecord } from './run-record.js';
import type { BatchSummary } from './summary.js';
import { summarize } from './summary.js';

/** What one input added in a run: all its lines in one journal line, so a torn append never lists half a file. */
export interface JournalEntry {
  path: string;
  lines: ResultsLine[];
}

export function indexText(lines: readonly ResultsLine[]): string {
  return lines.map((l) => JSON.stringify(l)).join('\n') + (lines.length ? '\n' : '');
}

export function indexSha256(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}

/**
 * Write the complete index: results.jsonl, then summary.json (which records the index's hash, so a summary left
 * behind by a cut-off run is recognized and rewritten, and the run that wrote it when one did), then drop the journal the index now holds. Each write is
 * atomic; the old index stays whole until the new one replaces it.
 */
export async function writeIndex(dir: string, lines: readonly ResultsLine[], run?: RunRecord): Promise<BatchSummary> {
  const text = indexText(lines);
  const summary = { ...summarize(lines), ...(run ? { run } : {}), index: { file: RESULTS_FILE, sha256: indexSha256(text) } };
  await writeFileAtomic(path.join(dir, RESULTS_FILE), text);
  await writeJsonAtomic(path.join(dir, SUMMARY_FILE), summary);
  await rm(path.join(dir, JOURNAL_FILE), { force: true });
  return summary;
}

/** Append one input's lines to the journal and flush them to disk before the run goes on. */
export async function appendJournal(dir: string, entry: JournalEntry): Promise<void> {
  const handle = await open(path.join(dir, JOURNAL_FILE), 'a');
  try {
    await handle.writeFile(JSON.stringify(entry) + '\n');
    await handle.sync();
  } finally {
    await handle.close();
  }
}
