import type { DocumentResult } from '../result/document.js';
import { countStatuses } from '../result/document.js';

/**
 * A new reading of a document whose scan, schema and model are unchanged keeps what a person decided: every field
 * the earlier record holds as corrected or confirmed is taken over whole (value, status, review block), so running
 * extract again never reverts review work.
 */
export function carryReviewedFields(read: DocumentResult, earlier: DocumentResult): DocumentResult {
  const reviewed = new Map(earlier.fields.filter((f) => f.status === 'corrected' || f.status === 'confirmed').map((f) => [f.name, f]));
  if (reviewed.size === 0) return read;
  const fields = read.fields.map((f) => reviewed.get(f.name) ?? f);
  return { ...read, fields, counts: countStatuses(fields) };
}
