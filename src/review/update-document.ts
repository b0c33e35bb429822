import type { FieldResult } from '../result/document.js';
import { countStatuses } from '../result/document.js';
import type { FieldUpdate } from './apply-plan.js';
import type { AuditEntry } from './audit.js';
import { LAYOUT_ROW_FIELD } from './layout-question.js';

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
    if (entry.field === LAYOUT_ROW_FIELD) {
      applyLayoutEntry(doc, entry);
      continue;
    }
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

/**
 * A layout answer written into a document. The layout keeps the status extraction gave it (unknown_layout) beside
 * the answer. Confirming the form takes the unknown_layout reason off every field and returns the fields held back
 * for it to accepted; the fields' other
 * doubts then come to the queue one by one. Another form, or none, only records the answer: the document leaves the
 * queue (to be read again with the named schema, or set aside). Undoing restores the question.
 */
function applyLayoutEntry(doc: Record<string, unknown>, entry: AuditEntry): void {
  const layout = doc.layout as Record<string, unknown> | undefined;
  if (!layout) throw new Error(`document "${entry.document}" has no layout to review`);
  const fields = doc.fields as { name: string; status: string; reasons: string[] }[];
  const held = new Set((layout.heldBack as string[] | undefined) ?? []);
  const wasConfirmed = (layout.review as { decision?: string } | undefined)?.decision === 'confirmed';
  if (entry.action === 'reverted') {
    delete layout.review;
    if (wasConfirmed) hold(fields, held);
    return;
  }
  const decision = entry.status === 'confirmed' ? 'confirmed' : entry.value === null ? 'not_a_form' : 'other_form';
  layout.review = {
    decision,
    ...(decision === 'other_form' ? { schema: entry.value } : {}),
    reviewer: entry.reviewer,
    at: entry.at,
    ...(entry.note !== undefined ? { note: entry.note } : {}),
  };
  if (decision === 'confirmed' && !wasConfirmed) {
    for (const f of fields) {
      f.reasons = f.reasons.filter((r) => r !== 'unknown_layout');
      if (held.has(f.name) && f.status === 'review') f.status = 'accepted';
    }
  } else if (decision !== 'confirmed' && wasConfirmed) {
    hold(fields, held);
  }
}

/** Back to an unknown layout: every field carries the reason again and none of the held-back ones is accepted. */
function hold(fields: { name: string; status: string; reasons: string[] }[], held: ReadonlySet<string>): void {
  for (const f of fields) {
    if (!f.reasons.includes('unknown_layout')) f.reasons.push('unknown_layout');
    if (held.has(f.name) && f.status === 'accepted') f.status = 'review';
  }
}
