import { isMap, isSeq, parseDocument } from 'yaml';
import { configError } from '../errors.js';

/**
 * Thresholds are written rounded down to 4 decimals: rounding down keeps every calibration sample the proposal
 * accepted still accepted, and 4 decimals are finer than any confidence difference that matters for review.
 */
export function roundThreshold(t: number): number {
  return Math.floor(t * 1e4 + 1e-9) / 1e4;
}

/** Map points as written to a schema: 4 decimals, so a threshold written the same way equals a level exactly. */
export function roundLevel(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}

/**
 * A copy of the schema text with `reviewThreshold` (and, when given, `confidenceMap`) set on the named fields. YAML keeps its comments and layout
 * (the `yaml` Document API edits the syntax tree in place) and gains a note saying where the thresholds came
 * from; JSON is rewritten with two-space indentation. Fields not named keep what they had.
 */
export function withReviewThresholds(
  text: string,
  file: string,
  thresholds: ReadonlyMap<string, number>,
  note: string,
  maps?: ReadonlyMap<string, [number, number][]>,
): string {
  const isJson = file.toLowerCase().endsWith('.json') || text.trimStart().startsWith('{');
  if (isJson) {
    const obj = JSON.parse(text) as { fields?: { name?: unknown; reviewThreshold?: number; confidenceMap?: unknown }[] };
    if (!Array.isArray(obj.fields)) throw configError(file, 'fields: expected a list of fields');
    for (const f of obj.fields) {
      if (typeof f.name !== 'string') continue;
      if (thresholds.has(f.name)) f.reviewThreshold = roundThreshold(thresholds.get(f.name)!);
      if (maps?.has(f.name)) f.confidenceMap = maps.get(f.name);
    }
    return JSON.stringify(obj, null, 2) + '\n';
  }
  const doc = parseDocument(text);
  const fields = doc.get('fields');
  if (!isSeq(fields)) throw configError(file, 'fields: expected a list of fields');
  fields.items.forEach((item, i) => {
    if (!isMap(item)) return;
    const name = item.get('name');
    if (typeof name !== 'string') return;
    if (thresholds.has(name)) doc.setIn(['fields', i, 'reviewThreshold'], roundThreshold(thresholds.get(name)!));
    if (maps?.has(name)) doc.setIn(['fields', i, 'confidenceMap'], doc.createNode(maps.get(name), { flow: true }));
  });
  const before = doc.commentBefore ? `${doc.commentBefore}\n` : '';
  doc.commentBefore = `${before} ${note.trim()}`;
  // Keep the hand-written look: no padding inside [ ], no folding of long lines.
  return doc.toString({ flowCollectionPadding: false, lineWidth: 0 });
}
