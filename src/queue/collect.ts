import path from 'node:path';
import type { DocumentResult } from '../result/document.js';
import { readResultsRecord } from '../results/document-record.js';
import { mergeLines, readIndex, warnOnStderr, type Warn } from '../results/index-read.js';
import { writeIndex } from '../results/index-write.js';
import { takeInputOutcomes } from '../results/input-outcome.js';
import { removeOrphanTemps } from '../results/temp-files.js';
import type { BatchSummary } from '../results/summary.js';
import { writeReviewQueue } from '../review/queue-write.js';

export interface CollectReport {
  /** Inputs whose outcome was folded in by this run. */
  inputs: number;
  /** The whole folder after collecting (what summary.json holds). */
  folder: BatchSummary;
  /** Temp files left by killed workers, removed. */
  orphans: number;
}

/** A temp file this old has no live writer: a record or a crop is written and renamed within seconds. */
export const STALE_TEMP_MS = 15 * 60_000;

/**
 * Fold what queue workers wrote into the results folder's index and review queue, as a local batch does at its end:
 * each input's outcome replaces that input's lines in results.jsonl (other inputs stay listed), summary.json is
 * rewritten from the index, and the review queue from every record the index lists (typed answers carried over by
 * queue-write). Safe to run while workers still run, and again: an input finished later is folded in next time.
 */
export async function collectResults(outDir: string, warn: Warn = warnOnStderr): Promise<CollectReport> {
  const index = await readIndex(outDir, warn);
  const taken = await takeInputOutcomes(outDir, warn);
  // One input at a time, in the order taken: a newer outcome of the same input replaces an older one whole.
  let lines = index.lines;
  for (const o of taken.outcomes) lines = mergeLines(lines, o.lines);
  const folder = await writeIndex(outDir, lines);
  await taken.release();
  const records = await Promise.all(
    lines.filter((l) => l.ok && l.json).map((l) => readResultsRecord(path.join(outDir, l.json as string)).catch(() => null)),
  );
  await writeReviewQueue(outDir, records.filter((r): r is DocumentResult => r !== null));
  // Temp files a killed worker left (they may hold crops of personal data). Workers on other machines may be writing
  // now, so only old ones go: one temp file is written and renamed within seconds (common practice margin).
  const orphans = await removeOrphanTemps(outDir, { staleAfterMs: STALE_TEMP_MS });
  return { inputs: taken.outcomes.length, folder, orphans };
}
