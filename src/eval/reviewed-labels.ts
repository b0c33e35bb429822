import type { DocumentResult, FieldResult } from '../result/document.js';
import type { CalibrationSample } from './calibration-thresholds.js';
import { valuesEqual } from './text-metrics.js';

/** A labeled field from a person's review, with the document it came from. */
export interface ReviewedSample extends CalibrationSample {
  document: string;
}

/**
 * Labels from review work already done: a field a person confirmed was read right; one they corrected was read
 * wrong (unless the correction equals what was read, e.g. only its status was settled). Fields nobody looked at are
 * not labels, whatever their status: an accepted field counts only once someone confirmed (or corrected) it, so a
 * spot check of accepted fields adds labels and the unchecked rest adds none.
 *
 * The confidence is the one the field was read with (`scores.raw` before a schema's confidence map, as calibration
 * fits raw confidences), which review does not change. Whether a threshold decided the field is judged on the status
 * it had before review, as src/eval/score.ts does with truth: accepted, or review with no ambiguity reason.
 */
export function reviewedSamples(documents: ReadonlyMap<string, DocumentResult>): ReviewedSample[] {
  const out: ReviewedSample[] = [];
  for (const [document, doc] of documents) {
    for (const f of doc.fields) {
      const label = reviewLabel(f);
      if (label === null) continue;
      const before = f.review!.previousStatus;
      out.push({
        document,
        field: f.name,
        type: f.type,
        confidence: f.scores?.raw ?? f.confidence,
        correct: label,
        decidable: before === 'accepted' || (before === 'review' && !f.reasons.some((c) => c.startsWith('ambiguous_'))),
      });
    }
  }
  return out;
}

/** Right (true), wrong (false), or not a label (null) for one field of a reviewed record. */
export function reviewLabel(f: FieldResult): boolean | null {
  if (!f.review) return null;
  if (f.status === 'confirmed') return true;
  if (f.status === 'corrected') return valuesEqual(f.review.previousValue, f.value);
  return null;
}
