import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { readResultsLines, RESULTS_FILE, type ResultsLine } from '../batch/sinks.js';
import { configError, documentError } from '../errors.js';
import { DocumentResult } from '../result/document.js';

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
}

export async function readStoredResult(file: string): Promise<StoredResult> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    throw documentError(file, `cannot read result JSON (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    throw documentError(file, `not valid JSON (${(err as Error).message.split('\n')[0]})`);
  }
  const parsed = DocumentResult.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw documentError(file, `not a formglean result: ${issue.path.join('.') || '(top level)'}: ${issue.message}`);
  }
  return { file, result: parsed.data, raw: raw as Record<string, unknown> };
}

/** The processed documents of an extract output folder, found through its results.jsonl. */
export async function readResultsFolder(dir: string): Promise<ResultsFolder> {
  let lines: ResultsLine[];
  try {
    lines = await readResultsLines(dir);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw configError(path.join(dir, RESULTS_FILE), 'not found; --results must name an extract output folder');
    if (err instanceof SyntaxError) throw configError(path.join(dir, RESULTS_FILE), `not valid JSON lines (${err.message})`);
    throw configError(undefined, (err as Error).message);
  }
  const documents: StoredResult[] = [];
  for (const line of lines) {
    if (!line.ok || !line.json) continue;
    documents.push(await readStoredResult(path.resolve(dir, line.json)));
  }
  return { dir, lines, documents };
}
