import { createHash } from 'node:crypto';
import { constants } from 'node:fs';
import { access, mkdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Detector } from '../detect/types.js';
import { configError, oneLine } from '../errors.js';
import { referencePageImage } from '../pipeline/reference-images.js';
import type { DigitReader } from '../read/digit-reader.js';
import type { DocumentResult } from '../result/document.js';
import { readResultsRecord } from '../results/document-record.js';
import { mergeLines, readIndex, warnOnStderr, type Warn } from '../results/index-read.js';
import { appendJournal, writeIndex } from '../results/index-write.js';
import type { ResultsLine } from '../results/results-line.js';
import { okLine, skippedLine } from '../results/results-line.js';
import type { BatchSummary } from '../results/summary.js';
import { summarize } from '../results/summary.js';
import { recordedPath } from '../results/recorded-path.js';
import { removeOrphanTemps } from '../results/temp-files.js';
import { writeReviewQueue } from '../review/queue-write.js';
import type { LoadedSchema } from '../schema/load.js';
import { readInput, sameInputs, type ReadingSetup } from './read-input.js';
import { discoverInputs, documentIds } from './discover.js';
import { IdClaims } from './id-claims.js';

export interface BatchOptions {
  inputs: readonly string[];
  /** One schema, or several (each document goes to the layout it aligns with best). */
  schemas: readonly LoadedSchema[];
  detector: Detector;
  outDir: string;
  /** Reuse a document's JSON when the file, schema and model are unchanged since it was written. */
  resume?: boolean;
  deskew?: boolean;
  orientation?: boolean;
  /** Read text from the page with the printed form subtracted (see ExtractOptions.dropout). */
  dropout?: boolean;
  /** Digit reader for digit combs (see ExtractOptions.digitReader). */
  digitReader?: DigitReader;
  today?: Date;
  /** Called after each document; carries no field values. */
  onDocument?: (event: DocumentEvent) => void;
  /** Warnings about the results folder (an index rebuilt); default: printed on stderr. Never field values. */
  warn?: Warn;
}

export interface DocumentEvent {
  index: number;
  total: number;
  file: string;
  line: ResultsLine;
  reused: boolean;
}

export interface BatchReport {
  /** This run's documents. */
  summary: BatchSummary;
  /** The whole results folder after the run (what summary.json holds): other inputs' records stay listed. */
  folder: BatchSummary;
  /** This run's lines, skipped inputs included. */
  lines: ResultsLine[];
  results: DocumentResult[];
}

export async function sha256Of(file: string): Promise<string> {
  return createHash('sha256').update(await readFile(file)).digest('hex');
}

/**
 * The records a previous run wrote for this file, when the file, the schemas and the model are unchanged: a file
 * that held a stack of forms has several (id.p1, id.p2, ...), all listed in the index.
 */
async function reusable(outDir: string, own: readonly ResultsLine[], file: string, options: BatchOptions): Promise<DocumentResult[] | null> {
  try {
    const ok = own.filter((l) => l.ok && l.json);
    if (ok.length === 0 || ok.length !== own.length) return null;
    const sha = await sha256Of(file);
    const records: DocumentResult[] = [];
    for (const l of ok) {
      const previous = await readResultsRecord(path.join(outDir, l.json as string));
      if (!sameInputs(previous, sha, options)) return null;
      records.push(previous);
    }
    return records;
  } catch {
    return null;
  }
}

/**
 * The id an input had in the folder before, so that it keeps it when this run's inputs name it differently (a folder
 * then, the file alone now): ids derive from the path relative to the run's inputs, and a new id would leave the old
 * record, with its review answers, unlisted. A stack's forms share the stem before ".pN".
 */
export function previousStem(own: readonly ResultsLine[]): string | undefined {
  const ids = own.map((l) => l.requestedId ?? l.document).filter((id) => id !== '');
  if (ids.length === 1) return ids[0];
  const stems = new Set(ids.map((id) => id.replace(/\.p\d+$/, '')));
  return stems.size === 1 ? [...stems][0] : undefined;
}

/**
 * Everything that can stop the run as a configuration error is checked before the results folder is touched: the
 * inputs exist, every schema's blank reference images decode, the folder can be created and written.
 */
export async function checkBeforeWriting(options: Pick<BatchOptions, 'schemas' | 'outDir'>): Promise<void> {
  for (const s of options.schemas) for (const [i] of s.schema.pages.entries()) await referencePageImage(s, i);
  try {
    await mkdir(options.outDir, { recursive: true });
    await access(options.outDir, constants.W_OK);
  } catch (err) {
    throw configError(options.outDir, `cannot write the results folder (${(err as NodeJS.ErrnoException).code ?? oneLine(err)})`);
  }
}

/**
 * Extract every input document into outDir: one JSON per document, review crops, the index (results.jsonl and
 * summary.json) and the review queue. The index is never emptied: each finished input is appended to a journal
 * that any reader replays, and the new index (this run's inputs merged into the previous one, other inputs' records
 * still listed) replaces the old one atomically at the end. A document that fails is recorded with its error and the
 * batch goes on; a configuration error stops it with the folder as it was.
 */
export async function runBatch(options: BatchOptions): Promise<BatchReport> {
  const warn = options.warn ?? warnOnStderr;
  const { files, skipped } = await discoverInputs(options.inputs, { exclude: [options.outDir] });
  await checkBeforeWriting(options);
  await removeOrphanTemps(options.outDir);
  const index = await readIndex(options.outDir, warn);
  // A run cut off earlier left a journal (or a summary behind its index): fold it in before anything else.
  if (index.needsWrite) await writeIndex(options.outDir, index.lines);
  const previous = index.lines.filter((l) => l.skipped === undefined);
  // Records and the index hold paths as recordedPath writes them; earlier indexes may hold absolute ones.
  const inRun = new Set(files.flatMap((f) => [recordedPath(f), f]));
  const claims = new IdClaims(previous.filter((l) => !inRun.has(l.path)));
  const stems = documentIds(files);
  const lines: ResultsLine[] = [];
  const results: DocumentResult[] = [];
  const setup: ReadingSetup = {
    schemas: options.schemas,
    detector: options.detector,
    outDir: options.outDir,
    deskew: options.deskew,
    orientation: options.orientation,
    dropout: options.dropout,
    digitReader: options.digitReader,
    today: options.today,
  };

  for (const [index, file] of files.entries()) {
    const recorded = recordedPath(file);
    const own = previous.filter((l) => l.path === recorded || l.path === file);
    const stem = previousStem(own) ?? (stems.get(file) as string);
    const reused = options.resume ? await reusable(options.outDir, own, file, options) : null;
    const fileLines: ResultsLine[] = [];
    if (reused) {
      for (const r of reused) claims.claim(r.document.id, recorded);
      results.push(...reused);
      fileLines.push(...reused.map(okLine));
    } else {
      const job = { file, recorded, stem, earlierJson: own.filter((l) => l.ok && l.json).map((l) => l.json as string) };
      const outcome = await readInput(job, setup, (requested) => claims.claim(requested, recorded));
      results.push(...outcome.results);
      fileLines.push(...outcome.lines);
    }
    await appendJournal(options.outDir, { path: recorded, lines: fileLines });
    lines.push(...fileLines);
    for (const line of fileLines) options.onDocument?.({ index, total: files.length, file, line, reused: reused !== null });
  }

  const skippedLines = skipped.map((s) => skippedLine(recordedPath(s.path), s.reason));
  const folderLines = mergeLines(previous, [...lines, ...skippedLines]);
  const folder = await writeIndex(options.outDir, folderLines);
  const kept = await Promise.all(
    folderLines
      .filter((l) => l.ok && l.json && !inRun.has(l.path))
      .map((l) => readResultsRecord(path.join(options.outDir, l.json as string)).catch(() => null)),
  );
  await writeReviewQueue(options.outDir, [...results, ...kept.filter((r): r is DocumentResult => r !== null)]);
  return { summary: summarize([...lines, ...skippedLines]), folder, lines: [...lines, ...skippedLines], results };
}
