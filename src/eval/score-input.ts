import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { glob } from 'tinyglobby';
import { z } from 'zod';
import { readIndex } from '../results/index-read.js';
import { RESULTS_FILE } from '../results/layout.js';
import { isFailed } from '../results/results-line.js';
import { configError } from '../errors.js';
import { formatJsonPath } from '../schema/load.js';
import type { DocumentResult } from '../result/document.js';
import { asConfigError, recordFromJson } from '../results/document-record.js';
import { TruthDocument } from '../result/truth.js';


/** A truth file with the stem of the page image it describes. */
export interface TruthEntry {
  stem: string;
  file: string;
  truth: TruthDocument;
}

export interface ResultEntry {
  stem: string;
  file: string;
  result: DocumentResult;
}

async function readJson(file: string): Promise<unknown> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    throw configError(file, `cannot read (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  try {
    return JSON.parse(text) as unknown;
  } catch (err) {
    throw configError(file, `not valid JSON: ${(err as Error).message.split('\n')[0]}`);
  }
}

function invalid(file: string, what: string, error: z.ZodError): never {
  const issue = error.issues[0];
  throw configError(file, `not a ${what}: ${formatJsonPath(issue.path)}: ${issue.message}`);
}

/** Stem of a file name: "scans/a-001.png" -> "a-001". */
export function fileStem(file: string): string {
  return path.parse(file).name;
}

async function jsonFiles(dir: string, pattern: string[]): Promise<string[]> {
  const files = await glob(pattern, { cwd: dir, absolute: true, onlyFiles: true, dot: false });
  return files.sort();
}

/**
 * Truth files of a samples folder: DIR/truth/*.json, or those of several sample sets in subfolders
 * (DIR/<set>/truth/*.json), or DIR itself when it is the truth folder.
 * Keyed by stem; two files with one stem are an error, since documents could not be matched.
 */
export async function loadTruth(dir: string): Promise<Map<string, TruthEntry>> {
  let files = await jsonFiles(dir, ['truth/*.json', '*/truth/*.json']);
  if (files.length === 0) files = await jsonFiles(dir, ['*.json']);
  const out = new Map<string, TruthEntry>();
  for (const file of files) {
    const raw = await readJson(file);
    // A samples folder's coco.json and other side files are not truth documents.
    if (!raw || typeof raw !== 'object' || !('fields' in raw) || !('fill' in raw)) continue;
    const parsed = TruthDocument.safeParse(raw);
    if (!parsed.success) invalid(file, 'truth file', parsed.error);
    const stem = fileStem(file);
    if (out.has(stem)) throw configError(file, `second truth file for document "${stem}"`);
    out.set(stem, { stem, file, truth: parsed.data });
  }
  if (out.size === 0) throw configError(dir, 'holds no truth files (expected truth/<stem>.json from samples generate)');
  return out;
}

/** A record among score's inputs: a bad one is a usage error (exit code 2), reported as every command reports it. */
function recordOrUsageError(raw: unknown, file: string): DocumentResult {
  try {
    return recordFromJson(raw, file).result;
  } catch (err) {
    throw asConfigError(err);
  }
}

/**
 * Document results of a results folder (DIR/<document>.json as extract writes them, or DIR/<batch>/<document>.json
 * for several batches, e.g. one per schema), keyed by the stem of the source image the result names. Other JSON
 * files there (summary, an earlier score) are skipped.
 */
export async function loadResults(dir: string): Promise<Map<string, ResultEntry>> {
  const files = await jsonFiles(dir, ['*.json', '*/*.json']);
  const out = new Map<string, ResultEntry>();
  for (const file of files) {
    const raw = await readJson(file);
    if (!raw || typeof raw !== 'object' || !('document' in raw) || !('fields' in raw)) continue;
    const result = recordOrUsageError(raw, file);
    // A file holding a stack of forms gives one record per form, named <file>.pN by extract (and by its truth).
    const form = /\.p\d+$/.exec(result.document.id)?.[0] ?? '';
    const stem = fileStem(result.document.path) + form;
    if (out.has(stem)) {
      throw configError(file, `second result for an image named "${stem}" (also ${path.basename(out.get(stem)!.file)})`);
    }
    out.set(stem, { stem, file, result });
  }
  return out;
}

/** Stems of documents the results folder (and its batch subfolders) list as failed: results.jsonl lines with ok false. */
export async function loadFailedStems(dir: string): Promise<Set<string>> {
  const out = new Set<string>();
  for (const file of await jsonFiles(dir, [RESULTS_FILE, `*/${RESULTS_FILE}`])) {
    const { lines } = await readIndex(path.dirname(file));
    for (const l of lines) if (isFailed(l)) out.add(fileStem(l.path));
  }
  return out;
}
