import { readFile, copyFile } from 'node:fs/promises';
import path from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { writeFileAtomic } from '../io/atomic-write.js';
import type { DocumentResult } from '../result/document.js';
import { confidenceToCell, valueToCell } from './cell-value.js';
import { listCrops } from './crops.js';
import { guardCell } from './formula-guard.js';
import { contextCropName, cropName, queuePath, reviewDir } from '../results/review-layout.js';
import { isPending } from './pending.js';
import type { QueueRow } from './queue-columns.js';
import { QUEUE_COLUMNS, REASON_SEPARATOR, REVIEWER_COLUMNS } from './queue-columns.js';
import { parseReviewQueue } from './queue-read.js';
import { resultFingerprint } from './result-fingerprint.js';
import { assignRowIds, reviewRowId } from './row-id.js';
import { candidatesCell, LAYOUT_ROW_FIELD, LAYOUT_ROW_TYPE, queueMode } from './layout-question.js';

/** Crop paths of a row, relative to queue.csv. */
export type CropLookup = (rowId: string, plainRowId: string) => { crop: string; context: string };

/** The one row of a document whose layout is unknown: which form is it? The first page is its crop. */
function layoutRow(doc: DocumentResult, hash: string, rowId: string, crops: CropLookup): QueueRow {
  const c = crops(rowId, reviewRowId(doc.document.sha256, LAYOUT_ROW_FIELD));
  return {
    row_id: rowId,
    document: doc.document.id,
    result_hash: hash,
    page: '1',
    field: LAYOUT_ROW_FIELD,
    type: LAYOUT_ROW_TYPE,
    status: 'review',
    value: doc.schema.name,
    raw: candidatesCell(doc),
    confidence: confidenceToCell(doc.layout?.score ?? 0),
    reasons: 'unknown_layout',
    crop: c.crop,
    context_crop: c.context,
    correction: '',
    confirm: '',
    note: '',
  };
}

/**
 * One row per field still waiting for review, documents in id order, fields in schema order; a document of
 * unknown layout has one row instead (layout-question.ts) until a person says which form it is, and a document
 * set aside as another form or no form has none.
 * Pure: crop paths come from `crops`.
 */
export function buildQueueRows(results: readonly DocumentResult[], crops: CropLookup): QueueRow[] {
  const ids = assignRowIds(results);
  const sorted = [...results].sort((a, b) => (a.document.id < b.document.id ? -1 : a.document.id > b.document.id ? 1 : 0));
  const rows: QueueRow[] = [];
  for (const doc of sorted) {
    const hash = resultFingerprint(doc);
    const mode = queueMode(doc);
    if (mode === 'layout') {
      rows.push(layoutRow(doc, hash, ids.get(doc.document.id)!.get(LAYOUT_ROW_FIELD)!, crops));
      continue;
    }
    if (mode === 'none') continue;
    for (const f of doc.fields) {
      if (!isPending(f.status)) continue;
      const rowId = ids.get(doc.document.id)!.get(f.name)!;
      const c = crops(rowId, reviewRowId(doc.document.sha256, f.name));
      rows.push({
        row_id: rowId,
        document: doc.document.id,
        result_hash: hash,
        page: String(f.page + 1),
        field: f.name,
        type: f.type,
        status: f.status,
        value: valueToCell(f.value),
        raw: f.raw ?? '',
        confidence: confidenceToCell(f.confidence),
        reasons: f.reasons.join(REASON_SEPARATOR),
        crop: c.crop,
        context_crop: c.context,
        correction: '',
        confirm: '',
        note: '',
      });
    }
  }
  return rows;
}

/**
 * RFC 4180 text: CRLF line ends (§2.1), a header line (§2.3), every cell in double quotes with inner quotes doubled
 * (§2.5-2.7; quoting every cell is also what OWASP's CSV-injection guidance asks), UTF-8 with a BOM so spreadsheets
 * pick the right encoding (common practice), every cell guarded against formula injection.
 */
export function queueCsv(rows: readonly QueueRow[]): string {
  return stringify(
    rows.map((r) => QUEUE_COLUMNS.map((c) => guardCell(r[c]))),
    { bom: true, header: true, columns: [...QUEUE_COLUMNS], quoted: true, quoted_empty: true, record_delimiter: 'windows' },
  );
}

/**
 * What a reviewer already typed into an existing queue, keyed by row id; kept only where the row still refers to
 * the same extraction (same result hash), so a rerun never attaches old answers to a new reading.
 */
function typedAnswers(file: string, bytes: Buffer): Map<string, Pick<QueueRow, 'correction' | 'confirm' | 'note' | 'result_hash'>> {
  const out = new Map<string, Pick<QueueRow, 'correction' | 'confirm' | 'note' | 'result_hash'>>();
  for (const { cells } of parseReviewQueue(file, bytes).entries) {
    if (!cells.row_id || !REVIEWER_COLUMNS.some((c) => (cells[c] ?? '').trim() !== '')) continue;
    out.set(cells.row_id, {
      correction: cells.correction ?? '',
      confirm: cells.confirm ?? '',
      note: cells.note ?? '',
      result_hash: cells.result_hash ?? '',
    });
  }
  return out;
}

/**
 * Write DIR/review/queue.csv for the given results. When a queue is already there with answers typed in, answers
 * for unchanged rows are carried over; if any answer cannot be carried (its document was extracted again, or the
 * field no longer needs review), the old file is first kept as queue.<time>.csv so no typed work is lost.
 * Returns the number of rows written.
 */
export async function writeReviewQueue(outDir: string, results: DocumentResult[]): Promise<number> {
  const file = queuePath(outDir);
  const present = await listCrops(outDir);
  const rows = buildQueueRows(results, (_id, plain) => ({
    crop: present.has(cropName(plain)) ? cropName(plain) : '',
    context: present.has(contextCropName(plain)) ? contextCropName(plain) : '',
  }));

  let previous: Buffer | undefined;
  try {
    previous = await readFile(file);
  } catch {
    previous = undefined;
  }
  if (previous !== undefined) {
    let answers: ReturnType<typeof typedAnswers> | undefined;
    try {
      answers = typedAnswers(file, previous);
    } catch {
      answers = undefined; // unreadable old queue: keep it aside below, do not merge from it
    }
    let lost = answers === undefined;
    for (const row of rows) {
      const a = answers?.get(row.row_id);
      if (a === undefined) continue;
      if (a.result_hash === row.result_hash) {
        row.correction = a.correction;
        row.confirm = a.confirm;
        row.note = a.note;
      }
      answers!.delete(row.row_id);
      if (a.result_hash !== row.result_hash) lost = true;
    }
    if (answers !== undefined && answers.size > 0) lost = true;
    if (lost) {
      const stamp = new Date().toISOString().replace(/[:.]/g, '-');
      await copyFile(file, path.join(reviewDir(outDir), `queue.${stamp}.csv`));
    }
  }
  await writeFileAtomic(file, queueCsv(rows));
  return rows.length;
}
