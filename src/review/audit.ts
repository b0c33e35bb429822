import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { documentError } from '../errors.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { FieldStatus } from '../result/document.js';

const Value = z.union([z.string(), z.number(), z.boolean(), z.array(z.string()), z.null()]);

/** One line of review/audit.jsonl: one field changed by a person through the review queue or the review page. */
export const AuditEntry = z.object({
  at: z.string(),
  reviewer: z.string(),
  /** reverted: the field's earlier answer was undone on the review page (value and status restored). */
  action: z.enum(['corrected', 'confirmed', 'reverted']),
  document: z.string(),
  field: z.string(),
  rowId: z.string(),
  previousValue: Value,
  previousStatus: FieldStatus,
  value: Value,
  status: FieldStatus,
  note: z.string().optional(),
  /** The queue file and its line the answer came from. */
  queue: z.string(),
  line: z.number().int(),
  /** How the answer was given: a row of the CSV queue, or the review page (formglean review serve). */
  via: z.enum(['queue', 'page']).optional(),
  /** Set when the entry was written on a later run because the run that changed the document was cut off before it logged. */
  recovered: z.boolean().optional(),
});
export type AuditEntry = z.infer<typeof AuditEntry>;

export async function readAudit(file: string): Promise<AuditEntry[]> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  const entries: AuditEntry[] = [];
  text.split('\n').forEach((line, i) => {
    if (line.trim() === '') return;
    let json: unknown;
    try {
      json = JSON.parse(line);
    } catch {
      throw documentError(file, `line ${i + 1} is not valid JSON`);
    }
    const parsed = AuditEntry.safeParse(json);
    if (!parsed.success) throw documentError(file, `line ${i + 1} is not an audit entry`);
    entries.push(parsed.data);
  });
  return entries;
}

/**
 * Append entries by rewriting the whole file atomically: a reader (or a run cut off by a kill) sees the old log or
 * the new one, never half a line.
 */
export async function appendAudit(file: string, entries: readonly AuditEntry[]): Promise<void> {
  if (entries.length === 0) return;
  let old = '';
  try {
    old = await readFile(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
  }
  if (old !== '' && !old.endsWith('\n')) old += '\n';
  await writeFileAtomic(file, old + entries.map((e) => JSON.stringify(e)).join('\n') + '\n');
}
