import { createHash } from 'node:crypto';
import { DocumentResult } from '../result/document.js';

/**
 * The parts of a document result that `review apply` itself rewrites: per field the value, its extra forms,
 * the status and the review block; per document the status counts derived from them; and an answer to the layout
 * question (layout-question.ts): the layout's review block and the unknown_layout reason on the fields. (A document
 * read before layout answers existed keeps its fingerprint, unless its layout was unknown.)
 */
const REVIEW_OWNED_FIELD_KEYS = new Set(['value', 'extra', 'status', 'review']);
const REVIEW_OWNED_DOCUMENT_KEYS = new Set(['counts']);
const REVIEW_OWNED_LAYOUT_KEYS = new Set(['review']);
const REVIEW_OWNED_REASON = 'unknown_layout';

/** JSON with object keys sorted at every level, so equal content always hashes the same. */
function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value) ?? 'null';
}

/**
 * Fingerprint of a document result as extraction left it: a sha256 over everything except what review apply
 * changes. It changes when the document is extracted again (new run time, boxes, confidences, raw text) or the
 * JSON is edited by hand outside those parts, and stays put while corrections are applied, so a queue can be
 * applied in several sittings. The result is read through its contract first, so the in-memory result extract
 * hands over and the JSON read back from disk give the same fingerprint even if one carries keys the other lacks.
 */
export function resultFingerprint(doc: unknown): string {
  const parsed = DocumentResult.safeParse(doc);
  const d = (parsed.success ? parsed.data : (doc ?? {})) as Record<string, unknown>;
  const kept: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(d)) if (!REVIEW_OWNED_DOCUMENT_KEYS.has(k)) kept[k] = v;
  if (d.layout !== null && typeof d.layout === 'object') {
    kept.layout = Object.fromEntries(Object.entries(d.layout as Record<string, unknown>).filter(([k]) => !REVIEW_OWNED_LAYOUT_KEYS.has(k)));
  }
  if (Array.isArray(d.fields)) {
    kept.fields = d.fields.map((f) => {
      const field: Record<string, unknown> = {};
      for (const [k, v] of Object.entries((f ?? {}) as Record<string, unknown>)) if (!REVIEW_OWNED_FIELD_KEYS.has(k)) field[k] = v;
      if (Array.isArray(field.reasons)) field.reasons = field.reasons.filter((r) => r !== REVIEW_OWNED_REASON);
      return field;
    });
  }
  return createHash('sha256').update(canonicalJson(kept)).digest('hex');
}
