import type { FieldValue } from '../fields/types.js';
import type { DocumentResult, FieldResult } from '../result/document.js';
import { isEmptyCorrection, readConfirm, typedCellProblem } from './answers.js';
import type { AuditEntry } from './audit.js';
import type { FieldTyping } from './field-options.js';
import type { QueueEntry } from './queue-read.js';
import { resultFingerprint } from './result-fingerprint.js';
import { assignRowIds } from './row-id.js';

export interface PlanDocument {
  result: DocumentResult;
  raw: Record<string, unknown>;
}

export interface PlanInput {
  entries: readonly QueueEntry[];
  documents: readonly PlanDocument[];
  typing: (doc: DocumentResult, field: FieldResult) => FieldTyping;
  reviewer: string;
  /** ISO 8601 time stamped on every change. */
  at: string;
  today: Date;
  /** The queue file as named on the command line, recorded in the audit log. */
  queue: string;
}

/** A row that is not applied, and why; never carries a field value (logs print no personal data). */
export interface RowProblem {
  line: number;
  rowId: string;
  message: string;
}

export interface FieldUpdate {
  entry: AuditEntry;
  /** New extra forms of the value; undefined keeps what is there (a confirmation). */
  extra: Record<string, string | number | boolean> | null | undefined;
}

export interface RowRef {
  line: number;
  rowId: string;
  document: string;
  field: string;
}

export interface ApplyPlan {
  updates: FieldUpdate[];
  /** Answered rows whose answer the document already holds (a second apply of the same queue). */
  alreadyApplied: RowRef[];
  /** Rows nobody answered yet. */
  unanswered: number;
  problems: RowProblem[];
}

function sameValue(a: FieldValue, b: FieldValue): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * Decide, row by row, what a reviewed queue changes. Pure: reads the documents, returns the changes and the
 * refused rows with their line numbers. A row is refused when its id is unknown, its document's result changed
 * since the queue was exported, its confirm cell is unreadable, or its correction fails the field type's checks.
 */
export function planApply(input: PlanInput): ApplyPlan {
  const byRowId = new Map<string, { doc: PlanDocument; field: FieldResult }>();
  const ids = assignRowIds(input.documents.map((d) => d.result));
  for (const doc of input.documents) {
    const fieldIds = ids.get(doc.result.document.id)!;
    for (const field of doc.result.fields) byRowId.set(fieldIds.get(field.name)!, { doc, field });
  }
  const fingerprints = new Map<PlanDocument, string>();
  const answeredAt = new Map<string, number>();
  const plan: ApplyPlan = { updates: [], alreadyApplied: [], unanswered: 0, problems: [] };

  for (const { line, cells } of input.entries) {
    const rowId = (cells.row_id ?? '').trim();
    const correction = (cells.correction ?? '').trim();
    const confirm = readConfirm(cells.confirm);
    const note = (cells.note ?? '').trim() || undefined;
    const refuse = (message: string) => plan.problems.push({ line, rowId, message });

    if (correction === '' && confirm === 'not_confirmed') {
      plan.unanswered++;
      continue;
    }
    const cellProblem = typedCellProblem('correction', correction) ?? typedCellProblem('note', note ?? '');
    if (cellProblem) {
      refuse(cellProblem);
      continue;
    }
    if (rowId === '') {
      refuse('no row_id; answers can only be applied to rows exported by formglean');
      continue;
    }
    if (confirm === 'unreadable') {
      refuse('confirm must be yes (or left empty)');
      continue;
    }
    const target = byRowId.get(rowId);
    if (!target) {
      refuse(`unknown row id ${rowId}: no document in the results folder has this field`);
      continue;
    }
    const { doc, field } = target;
    const docId = doc.result.document.id;
    if (cells.document !== undefined && cells.document.trim() !== '' && cells.document.trim() !== docId) {
      refuse(`row id ${rowId} belongs to document "${docId}", the row names "${cells.document.trim()}"`);
      continue;
    }
    if (cells.field !== undefined && cells.field.trim() !== '' && cells.field.trim() !== field.name) {
      refuse(`row id ${rowId} belongs to field "${field.name}", the row names "${cells.field.trim()}"`);
      continue;
    }
    const earlier = answeredAt.get(rowId);
    if (earlier !== undefined) {
      refuse(`row id ${rowId} is answered again (first at line ${earlier}); keep one answer per row`);
      continue;
    }
    answeredAt.set(rowId, line);
    let fp = fingerprints.get(doc);
    if (fp === undefined) {
      fp = resultFingerprint(doc.raw);
      fingerprints.set(doc, fp);
    }
    if ((cells.result_hash ?? '').trim() !== fp) {
      refuse(`the result of document "${docId}" changed since this queue was exported (extracted again?); export a new queue`);
      continue;
    }

    let value: FieldValue;
    let status: 'corrected' | 'confirmed';
    let extra: FieldUpdate['extra'];
    if (correction !== '') {
      status = 'corrected';
      if (isEmptyCorrection(correction)) {
        value = null;
        extra = null;
      } else {
        const typing = input.typing(doc.result, field);
        if ('error' in typing) {
          refuse(typing.error);
          continue;
        }
        const r = typing.type.parseCorrection(correction, typing.options, { today: input.today });
        if (r.outcome === 'invalid' || r.outcome === 'ambiguous') {
          const why = r.reasons.length ? r.reasons.join(', ') : r.outcome;
          refuse(`correction for field "${field.name}" is not a valid ${field.type} (${why}); not applied`);
          continue;
        }
        value = r.value;
        extra = r.extra && Object.keys(r.extra).length > 0 ? r.extra : null;
      }
    } else {
      status = 'confirmed';
      value = field.value;
      extra = undefined;
    }

    const ref: RowRef = { line, rowId, document: docId, field: field.name };
    if (field.status === status && sameValue(field.value, value) && field.review?.note === note) {
      plan.alreadyApplied.push(ref);
      continue;
    }
    plan.updates.push({
      extra,
      entry: {
        at: input.at,
        reviewer: input.reviewer,
        action: status,
        document: docId,
        field: field.name,
        rowId,
        previousValue: field.value,
        previousStatus: field.status,
        value,
        status,
        ...(note !== undefined ? { note } : {}),
        queue: input.queue,
        line,
      },
    });
  }
  return plan;
}
