import { iou } from '../image/geometry.js';
import type { DocumentResult, FieldResult, FieldStatus } from '../result/document.js';
import { reliability, type Reliability } from './reliability.js';
import { groupBy } from './score-groups.js';
import type { TruthDocument, TruthField } from '../result/truth.js';
import { editCount, pooledErrorRate, valuesEqual, valueText, type EditCount } from './text-metrics.js';

/** A result box counts as found when its IoU with the truth box reaches this (PASCAL VOC's 0.5, Everingham et al. 2010). */
export const LOCATION_IOU = 0.5;

/** One truth field set against what the tool made of it. */
export interface ScoredField {
  document: string;
  layout: string;
  fill: TruthDocument['fill'];
  field: string;
  type: string;
  /** Status the tool gave; "absent" when the result has no such field or the document has no result. */
  status: FieldStatus | 'absent';
  confidence: number;
  /** The confidence before the schema's confidence map (equal to `confidence` without a map): what calibration
   *  fits, so that refitting a calibrated schema does not map twice. */
  rawConfidence: number;
  correct: boolean;
  /** Accepted without review: status "accepted". Everything else waits for (or went through) a person. */
  accepted: boolean;
  /** A review threshold decides this field: accepted, or in review without an ambiguity reason (an ambiguous
   *  mark or date format goes to review whatever its confidence, as src/fields/scoring.ts rules; invalid and
   *  missing values too). */
  decidable: boolean;
  /** Edits from the normalized value to the true one, for text-valued fields read by OCR. */
  valueEdits: EditCount | null;
  /** Edits from the raw OCR text to the text as written on the page. */
  rawEdits: EditCount | null;
  /** IoU >= 0.5 with the truth box on the same page; null when the truth has no box. */
  located: boolean | null;
  /** Tick decisions: one per checkbox, one per printed box of a choice group; null for other fields. */
  marks: { decisions: number; correct: number } | null;
}

/** A checkbox is one tick decision; a choice group is one per printed box (ticked in truth vs in the value). */
function markDecisions(t: TruthField, value: FieldResult['value']): ScoredField['marks'] {
  if (t.parts && t.parts.length > 0) {
    const ticked = (key: string): boolean => (Array.isArray(value) ? value.includes(key) : value === key);
    return { decisions: t.parts.length, correct: t.parts.filter((p) => ticked(p.key) === p.checked).length };
  }
  if (t.type === 'checkbox') return { decisions: 1, correct: value === t.value ? 1 : 0 };
  return null;
}

function scoreAgainstTruth(doc: string, truth: TruthDocument, t: TruthField, r: FieldResult | undefined): ScoredField {
  const correct = valuesEqual(r?.value ?? null, t.value);
  const ocrField = t.text !== null;
  const truthText = valueText(t.value);
  const resultText = valueText(r?.value ?? null);
  const valueEdits = ocrField && truthText !== null ? editCount(resultText ?? String(r?.value), truthText) : null;
  const rawEdits = ocrField ? editCount(r?.raw ?? '', t.text ?? '') : null;
  let located: boolean | null = null;
  if (t.box) {
    const [x, y, w, h] = t.box;
    located = !!r?.box && r.box.page === t.page && iou(r.box, { x, y, w, h }) >= LOCATION_IOU;
  }
  const status = r?.status ?? 'absent';
  return {
    document: doc,
    layout: truth.layout,
    fill: truth.fill,
    field: t.name,
    type: t.type,
    status,
    confidence: r?.confidence ?? 0,
    rawConfidence: r?.scores?.raw ?? r?.confidence ?? 0,
    correct,
    accepted: status === 'accepted',
    decidable: status === 'accepted' || (status === 'review' && !r?.reasons.some((c) => c.startsWith('ambiguous_'))),
    valueEdits,
    rawEdits,
    located,
    marks: markDecisions(t, r?.value ?? null),
  };
}

/**
 * Score one document: every truth field against the result field of the same name. A document without a result
 * (extract failed on it) scores each field as absent, so failures count against accuracy instead of vanishing.
 */
export function scoreDocument(stem: string, truth: TruthDocument, result: DocumentResult | undefined): {
  fields: ScoredField[];
  /** Result fields with no truth field of that name (schema and generator disagree). */
  extraFields: number;
} {
  const byName = new Map<string, FieldResult>();
  for (const f of result?.fields ?? []) byName.set(f.name, f);
  const fields = truth.fields.map((t) => scoreAgainstTruth(stem, truth, t, byName.get(t.name)));
  const truthNames = new Set(truth.fields.map((t) => t.name));
  const extraFields = (result?.fields ?? []).filter((f) => !truthNames.has(f.name)).length;
  return { fields, extraFields };
}

/** Accuracy figures for a group of scored fields; each rate is null when its denominator is zero. */
export interface Metrics {
  fields: number;
  correct: number;
  /** Exact match of normalized values (checkbox accuracy, for checkbox fields). */
  exactMatch: number | null;
  /** Character error rate of normalized text values, pooled: total edits / total reference characters. */
  cer: number | null;
  /** Character error rate of raw OCR text against the text as written, pooled. */
  rawCer: number | null;
  /** Tick decisions (checkboxes, boxes of choice groups) and the share read right. */
  marks: number;
  markAccuracy: number | null;
  withBox: number;
  located: number;
  locationRecall: number | null;
  accepted: number;
  /** Share of fields accepted without review. */
  straightThrough: number | null;
  acceptedErrors: number;
  /** Wrong values among accepted fields. */
  errorAmongAccepted: number | null;
  errors: number;
  /** Wrong values the tool held back for review (status other than accepted). */
  caughtByReview: number;
  /** Wrong values accepted without review. */
  slippedThrough: number;
  /** Right values held back for review anyway: the reviewer's wasted effort. */
  needlessReview: number;
  /** Expected calibration error of the stated confidences (Guo et al. 2017). */
  ece: number | null;
}

const ratio = (a: number, b: number): number | null => (b > 0 ? a / b : null);

export function summarizeFields(items: readonly ScoredField[], bins: number): Metrics {
  const correct = items.filter((i) => i.correct).length;
  const withBox = items.filter((i) => i.located !== null).length;
  const located = items.filter((i) => i.located === true).length;
  const accepted = items.filter((i) => i.accepted).length;
  const acceptedErrors = items.filter((i) => i.accepted && !i.correct).length;
  const errors = items.length - correct;
  const valueEdits = items.flatMap((i) => (i.valueEdits ? [i.valueEdits] : []));
  const rawEdits = items.flatMap((i) => (i.rawEdits ? [i.rawEdits] : []));
  const marks = items.reduce((n, i) => n + (i.marks?.decisions ?? 0), 0);
  const marksRight = items.reduce((n, i) => n + (i.marks?.correct ?? 0), 0);
  return {
    fields: items.length,
    correct,
    exactMatch: ratio(correct, items.length),
    cer: pooledErrorRate(valueEdits),
    rawCer: pooledErrorRate(rawEdits),
    marks,
    markAccuracy: ratio(marksRight, marks),
    withBox,
    located,
    locationRecall: ratio(located, withBox),
    accepted,
    straightThrough: ratio(accepted, items.length),
    acceptedErrors,
    errorAmongAccepted: ratio(acceptedErrors, accepted),
    errors,
    caughtByReview: errors - acceptedErrors,
    slippedThrough: acceptedErrors,
    needlessReview: items.length - accepted - (errors - acceptedErrors),
    ece: reliability(items, bins).ece,
  };
}

/** Metrics per value of a key, keys sorted. */
export function metricsBy(
  items: readonly ScoredField[],
  key: (i: ScoredField) => string,
  bins: number,
): Record<string, Metrics> {
  const groups = groupBy(items, key);
  return Object.fromEntries([...groups.keys()].sort().map((k) => [k, summarizeFields(groups.get(k)!, bins)]));
}

export interface ScoreReport {
  format: 1;
  documents: { truth: number; scored: number; withoutResult: number; failed: number; resultsWithoutTruth: number };
  fields: { scored: number; extraInResults: number };
  bins: number;
  overall: Metrics;
  byFill: Record<string, Metrics>;
  byType: Record<string, Metrics>;
  /** "fill/type", e.g. "typed/date": the targets are stated per fill style. */
  byFillType: Record<string, Metrics>;
  byLayout: Record<string, Metrics>;
  /** "layout/field". */
  byField: Record<string, Metrics & { type: string }>;
  reliability: Reliability;
  /** Reliability of each fill style separately. */
  reliabilityByFill: Record<string, Reliability>;
}

export interface ScoreInput {
  truth: ReadonlyMap<string, TruthDocument>;
  results: ReadonlyMap<string, DocumentResult>;
  failed: ReadonlySet<string>;
  bins: number;
}

/** The whole comparison, pure: truth and results in, figures out. */
export function scoreAll(input: ScoreInput): { report: ScoreReport; items: ScoredField[] } {
  const { truth, results, failed, bins } = input;
  const items: ScoredField[] = [];
  let extra = 0;
  let withoutResult = 0;
  let failedCount = 0;
  for (const stem of [...truth.keys()].sort()) {
    const result = results.get(stem);
    if (!result) {
      withoutResult++;
      if (failed.has(stem)) failedCount++;
    }
    const scored = scoreDocument(stem, truth.get(stem)!, result);
    items.push(...scored.fields);
    extra += scored.extraFields;
  }
  const resultsWithoutTruth = [...results.keys()].filter((s) => !truth.has(s)).length;
  const byField = metricsBy(items, (i) => `${i.layout}/${i.field}`, bins) as ScoreReport['byField'];
  const typeOf = new Map(items.map((i) => [`${i.layout}/${i.field}`, i.type]));
  for (const [k, m] of Object.entries(byField)) m.type = typeOf.get(k)!;
  const fills = [...new Set(items.map((i) => i.fill))].sort();
  const report: ScoreReport = {
    format: 1,
    documents: {
      truth: truth.size,
      scored: truth.size - withoutResult,
      withoutResult,
      failed: failedCount,
      resultsWithoutTruth,
    },
    fields: { scored: items.length, extraInResults: extra },
    bins,
    overall: summarizeFields(items, bins),
    byFill: metricsBy(items, (i) => i.fill, bins),
    byType: metricsBy(items, (i) => i.type, bins),
    byFillType: metricsBy(items, (i) => `${i.fill}/${i.type}`, bins),
    byLayout: metricsBy(items, (i) => i.layout, bins),
    byField,
    reliability: reliability(items, bins),
    reliabilityByFill: Object.fromEntries(fills.map((f) => [f, reliability(items.filter((i) => i.fill === f), bins)])),
  };
  return { report, items };
}
