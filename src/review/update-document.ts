import type { FieldResult } from '../result/document.js';
import { countStatuses } from '../result/document.js';
import type { FieldUpdate } from './apply-plan.js';

/**
 * A document's raw result JSON with reviewed answers written in: new value and status, the review block
 * (previous value and status, reviewer, time, note), and the status counts recomputed. Pure; keys this version
 * does not know are kept as they were.
 */
export function applyUpdates(raw: Record<string, unknown>, updates: readonly FieldUpdate[]): Record<string, unknown> {
  const doc = structuredClone(raw);
  const fields = doc.fields as Record<string, unknown>[];
  for (const { entry, extra } of updates) {
    const f = fields.find((x) => x.name === entry.field);
    if (!f) throw new Error(`field "${entry.field}" not in document "${entry.document}"`);
    f.value = entry.value;
    f.status = entry.status;
    if (extra === null) delete f.extra;
    else if (extra !== undefined) f.extra = extra;
    f.review = {
      previousValue: entry.previousValue,
      previousStatus: entry.previousStatus,
      reviewer: entry.reviewer,
      at: entry.at,
      ...(entry.note !== undefined ? { note: entry.note } : {}),
    };
  }
  doc.counts = countStatuses(fields as unknown as FieldResult[]);
  return doc;
}
