import { readFile } from 'node:fs/promises';
import { DocumentResult } from '../result/document.js';

/** A document record (DIR/<id>.json) read through the result contract; throws when unreadable or not a result. */
export async function readResultsRecord(file: string): Promise<DocumentResult> {
  return DocumentResult.parse(JSON.parse(await readFile(file, 'utf8')));
}
