import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { DocumentResult } from '../../src/result/document.js';

/** Each record of a results folder without what differs between two runs of the same input (when it was made, how long it took). */
export async function records(dir: string): Promise<Map<string, unknown>> {
  const out = new Map<string, unknown>();
  for (const name of (await readdir(dir)).filter((f) => f.endsWith('.json') && f !== 'summary.json').sort()) {
    const r = DocumentResult.parse(JSON.parse(await readFile(path.join(dir, name), 'utf8')));
    out.set(name, { ...r, createdAt: undefined, seconds: undefined });
  }
  return out;
}
