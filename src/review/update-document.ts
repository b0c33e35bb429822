import type { FieldResult } from '../result/document.js';
import { countStatuses } from '../result/document.js';
import type { FieldUpdate } from './apply-plan.js';

/**
 * A document's raw result JSON with reviewed answers written in: new value and status, the review block
 * (previous value, extra forms and status, reviewer, time, note), and the status counts recomputed. An undone
 * answer restores what the review block kept and removes the block. Pure; keys this version does not know are
 * kept as they were.
 */
export function applyUpdates(raw: Record<string, unknown>, updates: readonly FieldUpdate[]): Record<string, unknown> {
  const doc = structuredClone(raw);
  const fields = doc.fields as Record<string, unknown>[];
  for (const { entry, extra } of updates) {
    const f = fields.find((x) => x.name === entry.field);
    if (!f) throw new Error(`field "${entry.field}" not in document "${entry.document}"`);
    const previousExtra = f.extra as Record<string, string | number | boolean> | undefined;
    f.value = entry.value;
    f.status = entry.status;
    if (extra === null) delete f.extra;
    else if (extra !== undefined) f.extra = extra;
    if (entry.action === 'reverted') {
      delete f.review;
      continue;
    }
    // A second answer keeps the first one's "before", so that undoing returns the field to what extraction read.
    const first = f.review as { previousValue: unknown; previousStatus: unknown; previousExtra?: unknown } | undefined;
    const keptExtra = first !== undefined ? first.previousExtra : previousExtra;
    f.review = {
      previousValue: first !== undefined ? first.previousValue : entry.previousValue,
      previousStatus: first !== undefined ? first.previousStatus : entry.previousStatus,
      ...(keptExtra !== undefined ? { previousExtra: keptExtra } : {}),
      reviewer: entry.reviewer,
      at: entry.at,
      ...(entry.note !== undefined ? { note: entry.note } : {}),
    };
  }
  doc.counts = countStatuses(fields as unknown as FieldResult[]);
  return doc;
}
