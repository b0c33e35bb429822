import path from 'node:path';
import { configError } from '../errors.js';
import type { DocumentResult } from '../result/document.js';
import { readRecord } from '../results/document-record.js';
import { readIndex, warnOnStderr, type Warn } from '../results/index-read.js';
import { RESULTS_FILE } from '../results/layout.js';
import type { ResultsLine } from '../results/results-line.js';

/** A document result as stored in a results folder: the validated view, and the raw JSON it is written back from. */
export interface StoredResult {
  /** Absolute path of the document JSON. */
  file: string;
  result: DocumentResult;
  /** The parsed JSON as found, so that keys this version does not know survive a rewrite. */
  raw: Record<string, unknown>;
}

export interface ResultsFolder {
  dir: string;
  lines: ResultsLine[];
  documents: StoredResult[];
  /** The index was rebuilt or extended from the journal on reading: writing it back completes it. */
  needsWrite: boolean;
}

export async function readStoredResult(file: string): Promise<StoredResult> {
  return { file, ...(await readRecord(file)) };
}

/** The processed documents of an extract output folder, found through its index (src/results/index-read.ts). */
export async function readResultsFolder(dir: string, warn: Warn = warnOnStderr): Promise<ResultsFolder> {
  let index;
  try {
    index = await readIndex(dir, warn);
  } catch (err) {
    throw configError(path.join(dir, RESULTS_FILE), `cannot read the results folder (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  if (index.empty) throw configError(path.join(dir, RESULTS_FILE), 'not found; --results must name an extract output folder');
  const documents: StoredResult[] = [];
  for (const line of index.lines) {
    if (!line.ok || !line.json) continue;
    documents.push(await readStoredResult(path.resolve(dir, line.json)));
  }
  return { dir, lines: index.lines, documents, needsWrite: index.needsWrite };
}
