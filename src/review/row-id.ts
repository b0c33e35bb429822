import { createHash } from 'node:crypto';
import type { DocumentResult } from '../result/document.js';
import { hasLayoutRow, LAYOUT_ROW_FIELD } from './layout-question.js';

/**
 * Stable review-queue row id: a hash of the document's content hash and the field name, so the same field of
 * the same scan keeps its id across runs. Prefixed with a letter so no spreadsheet takes it for a number.
 */
export function reviewRowId(documentSha256: string, fieldName: string, documentId?: string): string {
  const h = createHash('sha256').update(documentSha256).update('\0').update(fieldName);
  // Only a second copy of the same scan (same content under another name) mixes its document id in.
  if (documentId !== undefined) h.update('\0').update(documentId);
  return `r${h.digest('hex').slice(0, 16)}`;
}

/**
 * Row ids for every field of every document, deterministic for a given set of documents: documents are taken
 * in order of their id; the first document with a given content hash gets the plain id, later copies of the
 * same content get ids that also hash their document id.
 * Returns documentId -> fieldName -> rowId (the layout row under LAYOUT_ROW_FIELD).
 */
export function assignRowIds(results: readonly DocumentResult[]): Map<string, Map<string, string>> {
  const sorted = [...results].sort((a, b) => (a.document.id < b.document.id ? -1 : a.document.id > b.document.id ? 1 : 0));
  const firstBySha = new Map<string, string>();
  const out = new Map<string, Map<string, string>>();
  for (const r of sorted) {
    const owner = firstBySha.get(r.document.sha256);
    if (owner === undefined) firstBySha.set(r.document.sha256, r.document.id);
    const copy = owner !== undefined && owner !== r.document.id;
    const ids = new Map<string, string>();
    for (const f of r.fields) ids.set(f.name, reviewRowId(r.document.sha256, f.name, copy ? r.document.id : undefined));
    // A document of unknown layout also has its "which form is this?" row.
    if (hasLayoutRow(r)) ids.set(LAYOUT_ROW_FIELD, reviewRowId(r.document.sha256, LAYOUT_ROW_FIELD, copy ? r.document.id : undefined));
    out.set(r.document.id, ids);
  }
  return out;
}
