import { isMap, isSeq, parseDocument } from 'yaml';
import { configError } from '../errors.js';

/**
 * Thresholds are written rounded down to 4 decimals: rounding down keeps every calibration sample the proposal
 * accepted still accepted, and 4 decimals are finer than any confidence difference that matters for review.
 */
export function roundThreshold(t: number): number {
  return Math.floor(t * 1e4 + 1e-9) / 1e4;
}

/** What calibration writes into a schema for one field. With the map, the threshold is on the mapped scale. */
export interface SchemaFieldCalibration {
  reviewThreshold: number;
  confidenceMap: [number, number][];
}

/** Map points as written to a schema: 4 decimals, so a threshold written the same way equals a level exactly. */
export function roundLevel(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}

/**
 * A copy of the schema text with `reviewThreshold` and `confidenceMap` set on the named fields. YAML keeps its
 * comments and layout (the `yaml` Document API edits the syntax tree in place) and gains a note saying where the
 * values came from; JSON is rewritten with two-space indentation. Fields not named keep what they had.
 */
export function withCalibration(
  text: string,
  file: string,
  fields: ReadonlyMap<string, SchemaFieldCalibration>,
  note: string,
): string {
  const isJson = file.toLowerCase().endsWith('.json') || text.trimStart().startsWith('{');
  if (isJson) {
    const obj = JSON.parse(text) as { fields?: ({ name?: unknown } & Partial<SchemaFieldCalibration>)[] };
    if (!Array.isArray(obj.fields)) throw configError(file, 'fields: expected a list of fields');
    for (const f of obj.fields) {
      const c = typeof f.name === 'string' ? fields.get(f.name) : undefined;
      if (!c) continue;
      f.reviewThreshold = roundThreshold(c.reviewThreshold);
      f.confidenceMap = c.confidenceMap;
    }
    return JSON.stringify(obj, null, 2) + '\n';
  }
  const doc = parseDocument(text);
  const list = doc.get('fields');
  if (!isSeq(list)) throw configError(file, 'fields: expected a list of fields');
  list.items.forEach((item, i) => {
    const name = isMap(item) ? item.get('name') : undefined;
    const c = typeof name === 'string' ? fields.get(name) : undefined;
    if (!c) return;
    doc.setIn(['fields', i, 'reviewThreshold'], roundThreshold(c.reviewThreshold));
    doc.setIn(['fields', i, 'confidenceMap'], doc.createNode(c.confidenceMap, { flow: true }));
  });
  const before = doc.commentBefore ? `${doc.commentBefore}\n` : '';
  doc.commentBefore = `${before} ${note.trim()}`;
  // Keep the hand-written look: no padding inside [ ], no folding of long lines.
  return doc.toString({ flowCollectionPadding: false, lineWidth: 0 });
}
