import type { FieldValue } from '../fields/types.js';
import type { DocumentResult, FieldResult } from '../result/document.js';
import { isEmptyCorrection, readConfirm, typedCellProblem } from './answers.js';
import type { AuditEntry } from './audit.js';
import type { FieldTyping } from './field-options.js';
import { isPending } from './pending.js';
import { LAYOUT_ROW_FIELD, layoutAnswerStatus, layoutAnswerValue, parseLayoutAnswer } from './layout-question.js';
import type { QueueEntry } from './queue-read.js';
import { resultFingerprint } from './result-fingerprint.js';
import { assignRowIds } from './row-id.js';

export interface PlanDocument {
  result: DocumentResult;
  raw: Record<string, unknown>;
}

/**
 * One reviewer's answer to one queue row, however it was given (a row of the CSV queue, or the review page):
 * a correction (typed text, or the empty-field word), a confirmation of the value as read, or the undoing of
 * the answer the field holds (only the review page offers that).
 */
export interface Answer {
  /** Line of the queue file the row is on (the header is line 1). */
  line: number;
  rowId: string;
  /** The row's result_hash: the document as it was when the queue was written. */
  resultHash: string;
  /** Document and field as the row names them, when it does (checked against the row id). */
  document?: string;
  field?: string;
  action: { kind: 'correct'; text: string } | { kind: 'confirm' } | { kind: 'revert' };
  note?: string;
}

export interface PlanInput {
  answers: readonly Answer[];
  documents: readonly PlanDocument[];
  typing: (doc: DocumentResult, field: FieldResult) => FieldTyping;
  reviewer: string;
  /** ISO 8601 time stamped on every change. */
  at: string;
  today: Date;
  /** The queue file as named on the command line, recorded in the audit log. */
  queue: string;
  /** How the answers were given, recorded in the audit log. */
  via: 'queue' | 'page';
  /** The results folder as the user named it, for the command that makes a new queue in messages. */
  resultsDir: string;
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

/** The command that writes a fresh queue from the records, named in every stale-queue message. */
export function newQueueCommand(resultsDir: string): string {
  const dir = /^[\w./-]+$/.test(resultsDir) ? resultsDir : `"${resultsDir.replace(/"/g, '\\"')}"`;
  return `formglean review queue --results ${dir}`;
}

/** The answers of a CSV queue's rows; rows nobody answered are counted, unreadable ones refused. */
export function answersFromQueue(entries: readonly QueueEntry[]): { answers: Answer[]; unanswered: number; problems: RowProblem[] } {
  const out: ReturnType<typeof answersFromQueue> = { answers: [], unanswered: 0, problems: [] };
  for (const { line, cells } of entries) {
    const rowId = (cells.row_id ?? '').trim();
    const correction = (cells.correction ?? '').trim();
    const confirm = readConfirm(cells.confirm);
    if (correction === '' && confirm === 'not_confirmed') {
      out.unanswered++;
      continue;
    }
    if (rowId === '') {
      out.problems.push({ line, rowId, message: 'no row_id; answers can only be applied to rows exported by formglean' });
      continue;
    }
    if (confirm === 'unreadable') {
      out.problems.push({ line, rowId, message: 'confirm must be yes (or left empty)' });
      continue;
    }
    const note = (cells.note ?? '').trim() || undefined;
    out.answers.push({
      line,
      rowId,
      resultHash: (cells.result_hash ?? '').trim(),
      document: cells.document?.trim() || undefined,
      field: cells.field?.trim() || undefined,
      action: correction !== '' ? { kind: 'correct', text: correction } : { kind: 'confirm' },
      ...(note !== undefined ? { note } : {}),
    });
  }
  return out;
}

type Decision = { update: FieldUpdate } | { already: true } | { problem: string };

/** What one answer does to its field. Pure; the value never appears in a message. */
function decideAnswer(input: PlanInput, a: Answer, doc: PlanDocument, field: FieldResult): Decision {
  const docId = doc.result.document.id;
  let value: FieldValue;
  let status: FieldResult['status'];
  let extra: FieldUpdate['extra'];
  let action: AuditEntry['action'];
  if (a.action.kind === 'revert') {
    if (field.review === undefined || isPending(field.status) || field.status === 'accepted')
      return { problem: `field "${field.name}" of document "${docId}" holds no review answer to undo` };
    value = field.review.previousValue;
    status = field.review.previousStatus;
    extra = field.review.previousExtra ?? null;
    action = 'reverted';
  } else if (a.action.kind === 'correct' && isEmptyCorrection(a.action.text)) {
    value = null;
    extra = null;
    status = field.value === null && field.status !== 'corrected' ? 'confirmed' : 'corrected';
    action = status;
  } else if (a.action.kind === 'correct') {
    const typing = input.typing(doc.result, field);
    if ('error' in typing) return { problem: typing.error };
    const r = typing.type.parseCorrection(a.action.text, typing.options, { today: input.today });
    if (r.outcome === 'invalid' || r.outcome === 'ambiguous') {
      const why = r.reasons.length ? r.reasons.join(', ') : r.outcome;
      const accepts = typing.type.acceptedInput(typing.options);
      return { problem: `correction for field "${field.name}" is not a valid ${field.type} (${why}); the field accepts ${accepts}; not applied` };
    }
    value = r.value;
    // The value as read, typed again: the reviewer confirms it (the field keeps its extra forms).
    const same = sameValue(value, field.value) && field.status !== 'corrected';
    extra = same ? undefined : r.extra && Object.keys(r.extra).length > 0 ? r.extra : null;
    status = same ? 'confirmed' : 'corrected';
    action = status;
  } else {
    // An invalid field keeps the text read so the reviewer sees it, but that text failed the type's checks:
    // confirming it would put an unchecked value in the record, so only a correction (or "(empty)") settles it.
    if (field.status === 'invalid' && field.value !== null)
      return { problem: `field "${field.name}" of document "${docId}" failed its checks; type a correction instead of confirming; not applied` };
    value = field.value;
    status = 'confirmed';
    extra = undefined;
    action = 'confirmed';
  }

  if (action !== 'reverted' && field.status === status && sameValue(field.value, value) && field.review?.note === a.note) return { already: true };
  const entry = auditEntry(input, a, { action, document: docId, field: field.name, previousValue: field.value, previousStatus: field.status, value, status });
  return { update: { extra, entry } };
}

/** The audit entry of one answer: what changed, plus who, when, and where the answer came from. */
function auditEntry(
  input: PlanInput,
  a: Answer,
  change: Pick<AuditEntry, 'action' | 'document' | 'field' | 'previousValue' | 'previousStatus' | 'value' | 'status'>,
): AuditEntry {
  // Keys in the order audit.jsonl has always written them.
  return {
    at: input.at,
    reviewer: input.reviewer,
    action: change.action,
    document: change.document,
    field: change.field,
    rowId: a.rowId,
    previousValue: change.previousValue,
    previousStatus: change.previousStatus,
    value: change.value,
    status: change.status,
    ...(a.note !== undefined ? { note: a.note } : {}),
    queue: input.queue,
    line: a.line,
    via: input.via,
  };
}

/** What one answer to a layout row does to its document (layout-question.ts). Pure. */
function decideLayoutAnswer(input: PlanInput, a: Answer, doc: PlanDocument): Decision {
  const result = doc.result;
  const docId = result.document.id;
  const held = result.layout?.review;
  let value: FieldValue;
  let previousValue: FieldValue;
  let status: FieldResult['status'];
  let previousStatus: FieldResult['status'];
  let action: AuditEntry['action'];
  if (a.action.kind === 'revert') {
    if (held === undefined) return { problem: `the layout of document "${docId}" holds no review answer to undo` };
    previousValue = layoutAnswerValue(result, held);
    previousStatus = layoutAnswerStatus(held);
    value = result.schema.name;
    status = 'review';
    action = 'reverted';
  } else {
    const answer = parseLayoutAnswer(result, a.action);
    if ('problem' in answer) return { problem: answer.problem };
    if (held !== undefined && held.decision === answer.decision && held.schema === answer.schema && held.note === a.note) return { already: true };
    previousValue = held ? layoutAnswerValue(result, held) : result.schema.name;
    previousStatus = held ? layoutAnswerStatus(held) : 'review';
    value = layoutAnswerValue(result, answer);
    status = layoutAnswerStatus(answer);
    action = status;
  }
  const entry = auditEntry(input, a, { action, document: docId, field: LAYOUT_ROW_FIELD, previousValue, previousStatus, value, status });
  return { update: { extra: undefined, entry } };
}

/**
 * Decide, answer by answer, what the answers change. Pure: reads the documents, returns the changes and the
 * refused answers with their queue lines. An answer is refused when its row id is unknown, its document's result
 * changed since the queue was written, or its correction fails the field type's checks.
 */
export function planApply(input: PlanInput): ApplyPlan {
  const byRowId = new Map<string, { doc: PlanDocument; field: FieldResult | null }>();
  const ids = assignRowIds(input.documents.map((d) => d.result));
  for (const doc of input.documents) {
    const fieldIds = ids.get(doc.result.document.id)!;
    for (const field of doc.result.fields) byRowId.set(fieldIds.get(field.name)!, { doc, field });
    const layoutId = fieldIds.get(LAYOUT_ROW_FIELD);
    if (layoutId !== undefined) byRowId.set(layoutId, { doc, field: null });
  }
  const fingerprints = new Map<PlanDocument, string>();
  const answeredAt = new Map<string, number>();
  const plan: ApplyPlan = { updates: [], alreadyApplied: [], unanswered: 0, problems: [] };

  for (const a of input.answers) {
    const { line, rowId } = a;
    const refuse = (message: string) => plan.problems.push({ line, rowId, message });
    // Length and control-character limits, for the CSV queue and the review page alike.
    const cellProblem = (a.action.kind === 'correct' ? typedCellProblem('correction', a.action.text) : null) ?? typedCellProblem('note', a.note ?? '');
    if (cellProblem) {
      refuse(cellProblem);
      continue;
    }
    const target = byRowId.get(rowId);
    if (!target) {
      refuse(`unknown row id ${rowId}: no document in the results folder has this field`);
      continue;
    }
    const { doc, field } = target;
    const docId = doc.result.document.id;
    const fieldName = field?.name ?? LAYOUT_ROW_FIELD;
    if (a.document !== undefined && a.document !== docId) {
      refuse(`row id ${rowId} belongs to document "${docId}", the row names "${a.document}"`);
      continue;
    }
    if (a.field !== undefined && a.field !== fieldName) {
      refuse(`row id ${rowId} belongs to field "${fieldName}", the row names "${a.field}"`);
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
    if (a.resultHash !== fp) {
      refuse(`the result of document "${docId}" changed since this queue was written (extracted again?); make a new queue with: ${newQueueCommand(input.resultsDir)}`);
      continue;
    }
    const d = field === null ? decideLayoutAnswer(input, a, doc) : decideAnswer(input, a, doc, field);
    if ('problem' in d) refuse(d.problem);
    else if ('already' in d) plan.alreadyApplied.push({ line, rowId, document: docId, field: fieldName });
    else plan.updates.push(d.update);
  }
  return plan;
}
