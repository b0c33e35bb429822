import { createHash } from 'node:crypto';
import { constants } from 'node:fs';
import { access, mkdir, readFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { Detector } from '../detect/types.js';
import { configError, oneLine } from '../errors.js';
import { ReferencePages } from '../pipeline/reference-pages.js';
import type { DigitReader } from '../read/digit-reader.js';
import type { OcrEngine } from '../read/ocr-engine.js';
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
import { runRecord, type RunRecord } from '../results/run-record.js';
import { addStageTimes, emptyStageTimes } from '../results/stage-times.js';
import { writeReviewQueue } from '../review/queue-write.js';
import type { LoadedSchema } from '../schema/load.js';
import { sameInputs, type ReadingSetup } from './read-input.js';
import { inThreadReader, type InputReader } from './input-reader.js';
import { INPUTS_PER_THREAD } from './inputs-per-thread.js';
import { openWorkerPool } from './worker-pool.js';
import { discoverInputs, documentIds } from './discover.js';
import { IdClaims } from './id-claims.js';
import { awaitsRereading } from '../review/layout-question.js';

export interface BatchOptions {
  inputs: readonly string[];
  /** One schema, or several (each document goes to the layout it aligns with best). */
  schemas: readonly LoadedSchema[];
  detector: Detector;
  /** OCR engine of the reads in this thread (workers: 1); worker threads open their own. The caller closes it. */
  ocr: OcrEngine;
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
  /**
   * Inputs read at once by worker threads, each with its own detector session (opened from detector.path), digit
   * reader and OCR worker. 1 (the default): read in this thread with the detector and digit reader given.
   */
  workers?: number;
  /** onnxruntime intra-op threads of each worker's detector session (default: the cores shared out, at least 1). */
  threadsPerWorker?: number;
  /** Inputs each thread reads at once (default 2, src/batch/inputs-per-thread.ts); 1 reads them strictly one after another. */
  inputsPerThread?: number;
  /** Stop starting inputs: the ones in progress finish, then the index and the review queue are written. */
  signal?: AbortSignal;
  /** Called once the inputs are found, before any is read. */
  onStart?: (event: { inputs: number; workers: number }) => void;
  /** Called after each document; carries no field values. */
  onDocument?: (event: DocumentEvent) => void;
  /** Called once per input file, when all its documents are written (or it failed); carries no field values. */
  onInput?: (event: InputEvent) => void;
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

export interface InputEvent {
  /** Position of the file among the run's inputs (inputs finish out of order with several workers). */
  index: number;
  /** Inputs finished so far, this one included. */
  done: number;
  total: number;
  file: string;
  /** One line per form the file held (a stack of forms has several), or its failure. */
  lines: ResultsLine[];
  /** Kept unchanged from an earlier run (--resume): nothing was read. */
  reused: boolean;
  /** Pages read (0 when kept). */
  pages: number;
  /** Wall-clock seconds this input took to read (0 when kept). */
  seconds: number;
}

export interface BatchReport {
  /** This run's documents. */
  summary: BatchSummary;
  /** The whole results folder after the run (what summary.json holds): other inputs' records stay listed. */
  folder: BatchSummary;
  /** This run's lines, skipped inputs included. */
  lines: ResultsLine[];
  /** Speed, stage times and whether the run was interrupted (summary.json's `run`). */
  run: RunRecord;
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
      // A record a person set aside as another form is read again, with that form's schema (batch/read-input.ts).
      if (!sameInputs(previous, sha, options) || awaitsRereading(previous)) return null;
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
 * inputs exist, every schema's blank reference images decode, the folder can be created and written. Returns the
 * decoded blanks, for the readers in this thread.
 */
export async function checkBeforeWriting(options: Pick<BatchOptions, 'schemas' | 'outDir'>): Promise<ReferencePages> {
  const references = await ReferencePages.decode(options.schemas);
  try {
    await mkdir(options.outDir, { recursive: true });
    await access(options.outDir, constants.W_OK);
  } catch (err) {
    throw configError(options.outDir, `cannot write the results folder (${(err as NodeJS.ErrnoException).code ?? oneLine(err)})`);
  }
  return references;
}

/** Cores this process may use (os.availableParallelism, Node >= 18.14). */
export function availableCores(): number {
  return os.availableParallelism();
}

/**
 * Workers when none are asked for: one per core, but no more than half the machine's memory holds at 450 MB each
 * (the per-worker ceiling issue 21 sets; bench/batch-speed.md measured 355 MB).
 */
export function defaultWorkers(): number {
  const byMemory = Math.floor((os.totalmem() / 2) / (450 * 1024 * 1024));
  return Math.max(1, Math.min(availableCores(), byMemory));
}

/** Who reads the inputs: this thread, or a pool of worker threads each opening its own sessions. */
function inputReader(options: BatchOptions, workers: number, references: ReferencePages): InputReader {
  const setup: ReadingSetup = {
    schemas: options.schemas,
    references,
    detector: options.detector,
    ocr: options.ocr,
    outDir: options.outDir,
    deskew: options.deskew,
    orientation: options.orientation,
    dropout: options.dropout,
    digitReader: options.digitReader,
    today: options.today,
  };
  const perThread = Math.max(1, options.inputsPerThread ?? INPUTS_PER_THREAD);
  if (workers <= 1) return inThreadReader(setup, perThread);
  // Each worker's detector gets its share of the cores, so W workers do not start W x cores operator threads
  // (the detector is the only multi-threaded stage; tesseract.js and the digit reader run one thread each).
  const threads = options.threadsPerWorker ?? Math.max(1, Math.floor(availableCores() / workers));
  // Sessions, decoded blanks and the schemas' resolved field types do not cross into a thread: each worker opens,
  // decodes and resolves its own from plain data.
  const { detector: _d, digitReader: _r, references: _p, ocr: _o, schemas, ...rest } = setup;
  return openWorkerPool(
    { ...rest, schemas: schemas.map(({ schema, path, sha256 }) => ({ schema, path, sha256 })), modelPath: options.detector.path, intraOpThreads: threads, digitModelPath: options.digitReader?.path },
    workers,
    perThread,
  );
}

/**
 * Extract every input document into outDir: one JSON per document, review crops, the index (results.jsonl and
 * summary.json) and the review queue. The index is never emptied: each finished input is appended to a journal
 * that any reader replays, and the new index (this run's inputs merged into the previous one, other inputs' records
 * still listed) replaces the old one atomically at the end. A document that fails is recorded with its error and the
 * batch goes on; a configuration error stops it with the folder as it was.
 *
 * At most `workers` inputs are in flight, and only their index lines are kept: the review queue is rebuilt from the
 * records on disk at the end, so memory stays flat however many files the folder holds. When `signal` aborts, no
 * new input starts; the ones in progress finish and the index and queue are written as for a whole run.
 */
export async function runBatch(options: BatchOptions): Promise<BatchReport> {
  const warn = options.warn ?? warnOnStderr;
  const { files, skipped } = await discoverInputs(options.inputs, { exclude: [options.outDir] });
  const references = await checkBeforeWriting(options);
  await removeOrphanTemps(options.outDir);
  const index = await readIndex(options.outDir, warn);
  // A run cut off earlier left a journal (or a summary behind its index): fold it in before anything else.
  if (index.needsWrite) await writeIndex(options.outDir, index.lines);
  const previous = index.lines.filter((l) => l.skipped === undefined);
  // Records and the index hold paths as recordedPath writes them; earlier indexes may hold absolute ones.
  const inRun = new Set(files.flatMap((f) => [recordedPath(f), f]));
  const claims = new IdClaims(previous.filter((l) => !inRun.has(l.path)));
  const stems = documentIds(files);
  // A previous run's lines by the path they recorded, looked up once per input (not a scan of every line per input,
  // which a resumed run over a large folder would pay twice per file).
  const byPath = new Map<string, number[]>();
  previous.forEach((l, i) => {
    const at = byPath.get(l.path);
    if (at) at.push(i);
    else byPath.set(l.path, [i]);
  });
  // In the index's order, as the scan gave them.
  const ownLines = (file: string) => {
    const recorded = recordedPath(file);
    const at = recorded === file ? (byPath.get(file) ?? []) : [...(byPath.get(recorded) ?? []), ...(byPath.get(file) ?? [])].sort((a, b) => a - b);
    return at.map((i) => previous[i]);
  };
  // Every input's own id is held, in input order, before any input is read: a stack's derived ids (scan.p2) then never
  // take the name of a file beside it (scan.p2.png), whichever finishes first, so ids do not depend on timing.
  const stemOf = new Map(files.map((file) => [file, previousStem(ownLines(file)) ?? (stems.get(file) as string)]));
  for (const file of files) claims.claim(stemOf.get(file)!, recordedPath(file));
  const startedAt = new Date();
  const started = performance.now();
  const workers = Math.max(1, Math.min(options.workers ?? 1, files.length || 1));
  const reader = inputReader(options, workers, references);
  options.onStart?.({ inputs: files.length, workers });
  // Lines per input, in input order whatever order the inputs finish in.
  const perInput: ResultsLine[][] = [];
  const stages = emptyStageTimes();
  const count = { read: 0, kept: 0, pages: 0, done: 0 };

  const finish = async (index: number, file: string, fileLines: ResultsLine[], reused: boolean, seconds: number): Promise<void> => {
    const recorded = recordedPath(file);
    await appendJournal(options.outDir, { path: recorded, lines: fileLines });
    perInput[index] = fileLines;
    const pages = reused ? 0 : fileLines.reduce((a, l) => a + (l.pages ?? 0), 0);
    count.pages += pages;
    count.done++;
    for (const line of fileLines) options.onDocument?.({ index, total: files.length, file, line, reused });
    options.onInput?.({ index, done: count.done, total: files.length, file, lines: fileLines, reused, pages, seconds });
  };

  const inFlight = new Set<Promise<void>>();
  let fatal: unknown = null;
  try {
    for (const [index, file] of files.entries()) {
      if (options.signal?.aborted || fatal !== null) break;
      const recorded = recordedPath(file);
      const own = ownLines(file);
      const stem = stemOf.get(file)!;
      const reused = options.resume ? await reusable(options.outDir, own, file, options) : null;
      if (reused) {
        for (const r of reused) claims.claim(r.document.id, recorded);
        count.kept++;
        await finish(index, file, reused.map(okLine), true, 0);
        continue;
      }
      const job = { file, recorded, stem, earlierJson: own.filter((l) => l.ok && l.json).map((l) => l.json as string) };
      const inputStarted = performance.now();
      count.read++;
      const task = reader
        .read(job, (requested) => claims.claim(requested, recorded))
        .then(async (outcome) => {
          if (outcome.stages) addStageTimes(stages, outcome.stages);
          await finish(index, file, outcome.lines, false, (performance.now() - inputStarted) / 1000);
        })
        .catch((err: unknown) => {
          fatal ??= err;
        })
        .finally(() => inFlight.delete(task));
      inFlight.add(task);
      if (inFlight.size >= reader.concurrency) await Promise.race(inFlight);
    }
    await Promise.all(inFlight);
  } finally {
    await reader.close();
  }
  if (fatal !== null) throw fatal;

  const lines = perInput.filter((l) => l !== undefined).flat();
  const skippedLines = skipped.map((s) => skippedLine(recordedPath(s.path), s.reason));
  const folderLines = mergeLines(previous, [...lines, ...skippedLines]);
  const reached = count.read + count.kept;
  const run = runRecord(
    {
      startedAt: startedAt.toISOString(),
      wallSeconds: (performance.now() - started) / 1000,
      workers,
      inputs: { total: files.length, read: count.read, kept: count.kept, notReached: files.length - reached },
      pages: count.pages,
      interrupted: reached < files.length,
      // maxRSS is in kilobytes (Node's process.resourceUsage, getrusage(2)).
      peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
      cpuSeconds: Math.round((process.resourceUsage().userCPUTime + process.resourceUsage().systemCPUTime) / 1000) / 1000,
    },
    stages,
  );
  const folder = await writeIndex(options.outDir, folderLines, run);
  await writeReviewQueue(options.outDir, await recordsListed(options.outDir, folderLines));
  return { summary: summarize([...lines, ...skippedLines]), folder, lines: [...lines, ...skippedLines], run };
}

/** Every record the index lists, read back from disk (a record that cannot be read is left out of the queue). */
async function recordsListed(outDir: string, lines: readonly ResultsLine[]): Promise<DocumentResult[]> {
  const out: DocumentResult[] = [];
  for (const l of lines) {
    if (!l.ok || !l.json) continue;
    const r = await readResultsRecord(path.join(outDir, l.json)).catch(() => null);
    if (r) out.push(r);
  }
  return out;
}
