import type { FieldUpdate, RowRef } from './apply-plan.js';
import type { AuditEntry } from './audit.js';
import type { StoredResult } from './result-store.js';
import type { DocumentResult } from '../result/document.js';
import { LAYOUT_ROW_FIELD, layoutAnswerStatus, layoutAnswerValue } from './layout-question.js';

export function updatesByDocument(updates: readonly FieldUpdate[]): Map<string, FieldUpdate[]> {
  const out = new Map<string, FieldUpdate[]>();
  for (const u of updates) {
    const list = out.get(u.entry.document) ?? [];
    list.push(u);
    out.set(u.entry.document, list);
  }
  return out;
}

/**
 * Audit entries for answers a document already holds but the log lacks: a run killed after writing a document
 * and before writing the log. Rebuilt from the field's review block, which holds everything the entry needs.
 */
export function recoveredEntries(
  applied: readonly RowRef[],
  documents: ReadonlyMap<string, StoredResult>,
  audit: readonly AuditEntry[],
  queue: string,
): AuditEntry[] {
  const logged = new Set(audit.map((e) => `${e.rowId}\0${e.at}`));
  const out: AuditEntry[] = [];
  for (const ref of applied) {
    if (ref.field === LAYOUT_ROW_FIELD) {
      const entry = recoveredLayoutEntry(ref, documents.get(ref.document)?.result, queue);
      if (entry && !logged.has(`${ref.rowId}\0${entry.at}`)) {
        out.push(entry);
        logged.add(`${ref.rowId}\0${entry.at}`);
      }
      continue;
    }
    const field = documents.get(ref.document)?.result.fields.find((f) => f.name === ref.field);
    const review = field?.review;
    if (!field || !review || logged.has(`${ref.rowId}\0${review.at}`)) continue;
    if (field.status !== 'corrected' && field.status !== 'confirmed') continue;
    out.push({
      at: review.at,
      reviewer: review.reviewer,
      action: field.status,
      document: ref.document,
      field: ref.field,
      rowId: ref.rowId,
      previousValue: review.previousValue,
      previousStatus: review.previousStatus,
      value: field.value,
      status: field.status,
      ...(review.note !== undefined ? { note: review.note } : {}),
      queue,
      line: ref.line,
      recovered: true,
    });
    logged.add(`${ref.rowId}\0${review.at}`);
  }
  return out;
}

/** The audit entry of a layout answer the document holds, rebuilt from its layout review block. */
function recoveredLayoutEntry(ref: RowRef, doc: DocumentResult | undefined, queue: string): AuditEntry | null {
  const review = doc?.layout?.review;
  if (!doc || !review) return null;
  const status = layoutAnswerStatus(review);
  return {
    at: review.at,
    reviewer: review.reviewer,
    action: status,
    document: ref.document,
    field: LAYOUT_ROW_FIELD,
    rowId: ref.rowId,
    previousValue: doc.schema.name,
    previousStatus: 'review',
    value: layoutAnswerValue(doc, review),
    status,
    ...(review.note !== undefined ? { note: review.note } : {}),
    queue,
    line: ref.line,
    recovered: true,
  };
}
