import { reasonInfo } from '../../fields/reasons.js';
import type { DocumentResult, FieldResult } from '../../result/document.js';
import type { Answer } from '../apply-plan.js';
import { newQueueCommand } from '../apply-plan.js';
import { valueToCell } from '../cell-value.js';
import { FieldOptionsSource } from '../field-options.js';
import { queuePath } from '../../results/review-layout.js';
import type { QueueEntry } from '../queue-read.js';
import { readReviewQueue } from '../queue-read.js';
import { resultFingerprint } from '../result-fingerprint.js';
import { readResultsFolder, type StoredResult } from '../result-store.js';
import { assignRowIds } from '../row-id.js';
import { LAYOUT_ROW_FIELD, LAYOUT_ROW_TYPE, layoutAcceptedInput, layoutAnswerStatus, layoutAnswerValue } from '../layout-question.js';

/** A reason code as the page shows it: the code, and in plain words what it means and what to check. */
export interface PageReason {
  code: string;
  meaning: string;
  check: string;
}

/** One queue row as the review page shows it: what the queue says was read, and where the record stands now. */
export interface PageRow {
  rowId: string;
  line: number;
  document: string;
  /** The schema (form layout) the document was read with. */
  form: string;
  page: number;
  field: string;
  type: string;
  /** The value and OCR text as the queue lists them. */
  value: string;
  raw: string;
  confidence: string;
  reasons: PageReason[];
  /** What the reviewer may type, naming the accepted formats; null when the field's schema cannot be loaded. */
  accepts: string | null;
  /** Crop file names relative to the review folder ('' when there is none). */
  crop: string;
  contextCrop: string;
  /** The field in the record now: status, value, and the review answer it holds. */
  now: { status: FieldResult['status']; value: string; hasValue: boolean; reviewer?: string; note?: string } | null;
  /** Why the row cannot be answered here (document extracted again since the queue was written, or gone). */
  stale: string | null;
}

export interface PageView {
  rows: PageRow[];
  /** The command that writes a new queue, for stale rows. */
  newQueueCommand: string;
}

function reasonList(cell: string | undefined): PageReason[] {
  return (cell ?? '')
    .split(';')
    .map((c) => c.trim())
    .filter((c) => c !== '')
    .map((code) => {
      const info = reasonInfo(code);
      return info ? { code, meaning: info.meaning, check: info.check } : { code, meaning: 'A reason code this version does not describe.', check: 'The value against the crop.' };
    });
}

/** The queue rows, lines and cells, as the page answers them (each answer refers to its queue line). */
export async function readPageQueue(resultsDir: string): Promise<QueueEntry[]> {
  return (await readReviewQueue(queuePath(resultsDir))).entries.filter((e) => (e.cells.row_id ?? '').trim() !== '');
}

/** The page's rows: the queue of a results folder joined with the records as they are now. */
export async function buildPageView(resultsDir: string): Promise<PageView> {
  const entries = await readPageQueue(resultsDir);
  const folder = await readResultsFolder(resultsDir);
  return { rows: await pageRows(resultsDir, entries, folder.documents), newQueueCommand: newQueueCommand(resultsDir) };
}

/** Rows for the given queue entries from the given documents (all of the folder's: row ids depend on every one). */
export async function pageRows(resultsDir: string, entries: readonly QueueEntry[], documents: readonly StoredResult[]): Promise<PageRow[]> {
  const ids = assignRowIds(documents.map((d) => d.result));
  const byRow = new Map<string, { doc: DocumentResult; field: FieldResult; hash: () => string }>();
  for (const d of documents) {
    let hash: string | undefined;
    const fingerprint = () => (hash ??= resultFingerprint(d.raw));
    const fieldIds = ids.get(d.result.document.id)!;
    for (const f of d.result.fields) byRow.set(fieldIds.get(f.name)!, { doc: d.result, field: f, hash: fingerprint });
    const layoutId = fieldIds.get(LAYOUT_ROW_FIELD);
    if (layoutId !== undefined) byRow.set(layoutId, { doc: d.result, field: layoutAsField(d.result), hash: fingerprint });
  }
  const options = new FieldOptionsSource(resultsDir);
  const command = newQueueCommand(resultsDir);
  const rows: PageRow[] = [];
  for (const { line, cells } of entries) {
    const rowId = cells.row_id!.trim();
    const hit = byRow.get(rowId);
    let accepts: string | null = null;
    let stale: string | null = null;
    if (!hit) stale = 'No document in the results folder has this field any more.';
    else if ((cells.result_hash ?? '').trim() !== hit.hash()) stale = `The document was extracted again since this queue was written; make a new queue with: ${command}`;
    if (hit?.field.name === LAYOUT_ROW_FIELD) accepts = layoutAcceptedInput(hit.doc);
    else if (hit) {
      const typing = await options.typing(hit.doc, hit.field.name, hit.field.type);
      accepts = 'error' in typing ? null : typing.type.acceptedInput(typing.options);
    }
    const f = hit?.field;
    rows.push({
      rowId,
      line,
      document: (cells.document ?? '').trim() || (hit?.doc.document.id ?? ''),
      form: hit?.doc.schema.name ?? '',
      page: Number(cells.page ?? '1') || 1,
      field: (cells.field ?? '').trim() || (f?.name ?? ''),
      type: (cells.type ?? '').trim() || (f?.type ?? ''),
      value: cells.value ?? '',
      // Queues written before the column was renamed call it ocr_text.
      raw: cells.raw ?? (cells as Record<string, string | undefined>).ocr_text ?? '',
      confidence: cells.confidence ?? '',
      reasons: reasonList(cells.reasons),
      accepts,
      crop: cells.crop ?? '',
      contextCrop: cells.context_crop ?? '',
      now: f
        ? {
            status: f.status,
            value: valueToCell(f.value),
            hasValue: f.value !== null && !(Array.isArray(f.value) && f.value.length === 0),
            ...(f.review ? { reviewer: f.review.reviewer } : {}),
            ...(f.review?.note !== undefined ? { note: f.review.note } : {}),
          }
        : null,
      stale,
    });
  }
  return rows;
}

/** A document's layout question seen as a field, so the page shows where its answer stands like any other row's. */
function layoutAsField(doc: DocumentResult): FieldResult {
  const review = doc.layout?.review;
  return {
    name: LAYOUT_ROW_FIELD,
    type: LAYOUT_ROW_TYPE,
    page: 0,
    value: review === undefined ? doc.schema.name : layoutAnswerValue(doc, review),
    raw: null,
    status: review === undefined ? 'review' : layoutAnswerStatus(review),
    confidence: doc.layout?.score ?? 0,
    reasons: ['unknown_layout'],
    box: null,
    source: 'none',
    scores: {},
    ...(review ? { review: { previousValue: doc.schema.name, previousStatus: 'review' as const, reviewer: review.reviewer, at: review.at, ...(review.note !== undefined ? { note: review.note } : {}) } } : {}),
  };
}

/** What the page posts for one row. */
export interface PageAnswer {
  rowId: string;
  action: 'correct' | 'confirm' | 'blank' | 'revert';
  text?: string;
  note?: string;
}

/** A page answer as the Answer every review path applies, tied to the row's queue line and result hash. */
export function answerFromPage(entry: QueueEntry, a: PageAnswer, emptyWord: string): Answer {
  const note = a.note?.trim() || undefined;
  const action: Answer['action'] =
    a.action === 'revert'
      ? { kind: 'revert' }
      : a.action === 'confirm'
        ? { kind: 'confirm' }
        : { kind: 'correct', text: a.action === 'blank' ? emptyWord : (a.text ?? '').trim() };
  return {
    line: entry.line,
    rowId: a.rowId,
    resultHash: (entry.cells.result_hash ?? '').trim(),
    document: entry.cells.document?.trim() || undefined,
    field: entry.cells.field?.trim() || undefined,
    action,
    ...(note !== undefined ? { note } : {}),
  };
}
