import { readFile } from 'node:fs/promises';
import { documentError, FormgleanError } from '../errors.js';
import { DocumentResult } from '../result/document.js';

/** A record as read: the validated result, and the JSON as written (for fingerprints and members this version does not know). */
export interface RecordRead {
  result: DocumentResult;
  raw: Record<string, unknown>;
}

/**
 * Parse a document record's JSON text through the result contract. The one place a record is read, so every
 * command reports a bad one the same way: one line naming the file and the problem (exit code 1: a document).
 */
export function parseResultsRecord(text: string, file: string): RecordRead {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    throw documentError(file, `not valid JSON (${(err as Error).message.split('\n')[0]})`);
  }
  return recordFromJson(raw, file);
}

/** Validate parsed JSON as a document record. */
export function recordFromJson(raw: unknown, file: string): RecordRead {
  const parsed = DocumentResult.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw documentError(file, `not a formglean document result: ${issue.path.join('.') || '(top level)'}: ${issue.message}`);
  }
  return { result: parsed.data, raw: raw as Record<string, unknown> };
}

/** Read a document record (DIR/<id>.json); throws a one-line FormgleanError when unreadable or not a record. */
export async function readRecord(file: string): Promise<RecordRead> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw documentError(file, code === 'ENOENT' ? 'file not found' : `cannot read (${code ?? 'error'})`);
  }
  return parseResultsRecord(text, file);
}

export async function readResultsRecord(file: string): Promise<DocumentResult> {
  return (await readRecord(file)).result;
}

/** The same problem as a configuration error (exit code 2), for a record named on the command line. */
export function asConfigError(err: unknown): unknown {
  return err instanceof FormgleanError && err.exitCode === 1 && err.file !== undefined
    ? new FormgleanError(err.message.slice(err.message.indexOf(': ') + 2), { file: err.file, exitCode: 2, cause: err.cause })
    : err;
}
