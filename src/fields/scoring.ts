import { applyConfidenceMap, type ConfidenceMapPoints } from './confidence-map.js';
import type { Interpretation, Reading } from './types.js';
import type { ReasonCode } from './reasons.js';
import type { FieldSource, FieldStatus, ReadStatus } from '../result/document.js';
import { round3 } from '../result/rounding.js';

/**
 * Confidence and status of one field, from everything known about it (pure).
 *
 * confidence = location × reading × value (× legibility for OCR reads), each factor 0..1:
 *  - location: how the area was found. A detection contributes 0.8 + 0.2 × its score (detector scores rank well but
 *    are not calibrated probabilities, so a low score dents rather than sinks the field); the schema region after
 *    page alignment (region fallback) earns from REGION_FALLBACK_FACTOR up to 1 by how well the page aligned
 *    (regionFactor: image-registration correlation, fit residual, the local touch-up's correlation); without such
 *    evidence it stays at REGION_FALLBACK_FACTOR; nothing located is 0.
 *  - reading: for OCR, 0.6 × the weakest word's confidence + 0.4 × the mean word confidence — one garbled word
 *    spoils a date or a phone number however clean the rest is; with no words, tesseract's crop confidence. Marks
 *    and ink readings have no OCR and contribute 1 (their evidence is in `value`).
 *  - value: the field type's own confidence (repairs, fuzzy matches, distance of a mark from its thresholds).
 *  - legibility: how well the form's other OCR fields read (legibility.ts), for OCR-read, non-blank fields.
 *  - checks: INVALID_FACTOR when the value fails its type's checks.
 * The weights and constants are common practice, chosen so that one weak factor alone can send a field to review
 * under the default threshold 0.75 while a clean read with a middling detection score is accepted.
 *
 * With a confidence map (fitted on labeled forms by `formglean calibrate`) the product above is the raw
 * confidence, kept in `scores.raw`, and the stated confidence is the map's accuracy at it. A shipped map
 * (default-confidence.ts) reads the factors each raised to a fitted power instead (`factorWeights`, kept in
 * `scores.weighted`); `scores.raw` stays the plain product either way.
 *
 * Status: missing when required and nothing was located or read; invalid when the value fails its type's checks;
 * review when the evidence is ambiguous or the confidence is under the review threshold; accepted otherwise. An
 * optional field left blank is accepted with a null value.
 */
export interface ScoreInput {
  detectionScore: number | null;
  source: FieldSource;
  reading: Reading | null;
  interpretation: Interpretation | null;
  reviewThreshold: number;
  required: boolean;
  confidenceMap?: ConfidenceMapPoints;
  /** Form legibility factor for OCR-read fields (legibility.ts); 1 when absent. */
  legibility?: number;
  /** How well the field's page aligned, for a field read at its schema region (source 'region'). */
  alignment?: AlignmentEvidence;
  /** Powers of the factors in the product the confidence map reads (a shipped map's, default-confidence.ts);
   *  absent: the plain product. */
  factorWeights?: FactorWeights;
}

/** The confidence factors by name, as a shipped map weighs them (each a power, >= 0). */
export interface FactorWeights {
  location: number;
  ocr: number;
  value: number;
  legibility: number;
  checks: number;
}

/** What is known of a page's alignment at one field (src/page/alignment.ts, src/page/local-refine.ts). */
export interface AlignmentEvidence {
  /** 'image', 'image+detections', 'detections' or 'identity' (src/page/alignment.ts). */
  method: string;
  /** 0..1: image-registration correlation, or the share of regions matched for 'detections'. */
  score: number;
  /** Reference pixels: RMS disagreement of detections and the fit; null when nothing measured it. */
  residual: number | null;
  /** Lowest correlation of the local touch-up over the field's region parts (-1..1); null when none ran. */
  refine: number | null;
}

export interface FieldScore {
  status: ReadStatus;
  confidence: number;
  reasons: ReasonCode[];
  scores: Record<string, number>;
}

/** Under this detector score the detection itself is worth a reason code (common practice for YOLO-style scores). */
export const LOW_DETECTION_SCORE = 0.35;
/** Factor on the confidence of a value that fails its type's checks: on the development set (seeds 800101-800302)
 *  2 of 132 such values were right after normalization. */
export const INVALID_FACTOR = 0.1;
/** OCR factor under which a field with a confidence map gets the reason low_ocr_confidence (the default review
 *  threshold; common practice). */
export const LOW_OCR_CONFIDENCE = 0.75;
/** Share of the location factor a detection earns whatever its score (see locationFactor). On the development set
 *  (seeds 800101-800302) 0.8, 0.9 and 0.95 ranked right and wrong typed values alike; 0.8 is kept. */
export const DETECTION_BASE = 0.8;
/** Location factor for a field read at its schema region because no detection matched, when nothing says how well
 *  the page aligned (the floor of regionFactor; common practice, kept from before evidence was used). */
export const REGION_FALLBACK_FACTOR = 0.85;

/**
 * Evidence ramps for a region read (each maps its measure linearly onto 0..1 between its two ends):
 *  - REGISTRATION_RAMP: zero-mean NCC of the page's ink with the blank after image registration
 *    (src/page/align-image.ts). On the real-form bench's development forms (bench/real-forms.ts --half dev --count 2
 *    --only irs-f8888-2025,irs-f941-2024,ssa-827-2020,uscourts-b2030-2025) every page, typed or handwritten,
 *    registered at 0.944-0.978; align-image.ts rejects a fit under 0.3 as degenerate. Full credit from 0.9, none
 *    under 0.7.
 *  - TOUCHUP_RAMP: the local touch-up's correlation at its best shift (src/page/local-refine.ts). refineRegion
 *    trusts a shift from 0.5 (its default minScore); entries written into the window lower the correlation with
 *    the blank, so full credit comes well under 1: on the development pages above, region reads that were right
 *    (typed and handwritten) had touch-ups at 0.54-0.95, most 0.6-0.75, and the wrong ones were no lower (their
 *    errors were the OCR's, which the reading factor carries). Full credit from 0.6, none under 0.4.
 *  - RESIDUAL_RAMP (reversed), for an alignment from detections alone: RMS distance, reference pixels, of the
 *    matched detections from their regions after the fit. Within 2 px a text line's region still holds its entry
 *    (common practice: regions carry a few pixels of margin); 8 px is align.ts's "agree within" (about 1 mm at 200
 *    dpi). For an image alignment the residual is how far the losing detection estimate lay from the image fit
 *    that won on whole-page correlation (src/page/align.ts); it says little of the fit and is not used: on the
 *    development forms above it ran from 11 to 168 px on pages whose region reads were right.
 *  - MATCHED_RAMP: for an alignment from detections alone, the share of regions a detection matched (common
 *    practice: a fit on under a third of the regions is weak, on more than 60 % as good as it gets from boxes).
 */
export const REGISTRATION_RAMP: readonly [number, number] = [0.7, 0.9];
export const TOUCHUP_RAMP: readonly [number, number] = [0.4, 0.6];
export const RESIDUAL_RAMP: readonly [number, number] = [2, 8];
export const MATCHED_RAMP: readonly [number, number] = [0.3, 0.6];

function ramp(v: number, [lo, hi]: readonly [number, number]): number {
  return clamp01((v - lo) / (hi - lo));
}

/**
 * Location factor of a field read at its aligned schema region: REGION_FALLBACK_FACTOR plus the rest up to 1 in
 * proportion to the weakest piece of alignment evidence. No evidence (identity, or none passed) keeps the floor.
 */
export function regionFactor(evidence: AlignmentEvidence | undefined): number {
  if (!evidence || evidence.method === 'identity') return REGION_FALLBACK_FACTOR;
  const parts: number[] = [];
  if (evidence.method === 'detections') {
    parts.push(ramp(evidence.score, MATCHED_RAMP));
    if (evidence.residual !== null) parts.push(1 - ramp(evidence.residual, RESIDUAL_RAMP));
  } else {
    parts.push(ramp(evidence.score, REGISTRATION_RAMP));
  }
  if (evidence.refine !== null) parts.push(ramp(evidence.refine, TOUCHUP_RAMP));
  return REGION_FALLBACK_FACTOR + (1 - REGION_FALLBACK_FACTOR) * Math.min(...parts);
}

export function locationFactor(source: ScoreInput['source'], detectionScore: number | null, alignment?: AlignmentEvidence): number {
  if (source === 'none') return 0;
  if (source === 'region') return regionFactor(alignment);
  return DETECTION_BASE + (1 - DETECTION_BASE) * clamp01(detectionScore ?? 0);
}

/** OCR factor: the weakest word counts most (see the formula above). */
export function ocrFactor(reading: Reading): number {
  if (reading.kind !== 'text') return 1;
  const confs = reading.words.map((w) => clamp01(w.confidence));
  if (confs.length === 0) return clamp01(reading.confidence);
  const weakest = Math.min(...confs);
  const mean = confs.reduce((a, b) => a + b, 0) / confs.length;
  return 0.6 * weakest + 0.4 * mean;
}

function clamp01(v: number): number {
  return Number.isFinite(v) ? Math.min(1, Math.max(0, v)) : 0;
}

function unique(codes: ReasonCode[]): ReasonCode[] {
  return [...new Set(codes)];
}

export function scoreField(input: ScoreInput): FieldScore {
  const { source, detectionScore, reading, interpretation, reviewThreshold, required, confidenceMap } = input;
  const legibility = clamp01(input.legibility ?? 1);
  const scores: Record<string, number> = {};
  const reasons: ReasonCode[] = [];
  const location = locationFactor(source, detectionScore, input.alignment);
  scores.location = round3(location);
  if (source === 'region' && input.alignment) {
    scores.registration = round3(clamp01(input.alignment.score));
    if (input.alignment.refine !== null) scores.touchup = round3(clamp01(input.alignment.refine));
  }
  if (source === 'detection' && detectionScore !== null) {
    scores.detection = round3(clamp01(detectionScore));
    if (detectionScore < LOW_DETECTION_SCORE) reasons.push('low_detection_score');
  }
  if (source === 'region') reasons.push('region_fallback');

  if (source === 'none' || reading === null || interpretation === null) {
    reasons.push(source === 'none' ? 'not_located' : 'not_read');
    return { status: required ? 'missing' : 'review', confidence: 0, reasons: unique(reasons), scores };
  }

  // A blank area has no OCR words worth scoring; its evidence is only where it was looked for.
  const blank = interpretation.outcome === 'empty';
  const read = blank ? 1 : ocrFactor(reading);
  if (reading.kind === 'text' && !blank) {
    scores.ocr = round3(read);
    // With a map the threshold is an accuracy (often 0.99), not a bar for the OCR factor alone.
    if (read < (confidenceMap ? LOW_OCR_CONFIDENCE : reviewThreshold)) reasons.push('low_ocr_confidence');
  }
  scores.value = round3(clamp01(interpretation.confidence));
  const legible = reading.kind === 'text' && !blank ? legibility : 1;
  if (legible < 1) scores.legibility = round3(legible);
  // A value that fails its type's checks goes to review whatever its confidence; its confidence should still say
  // how likely it is right, and such values rarely are (INVALID_FACTOR).
  const checks = interpretation.outcome === 'invalid' ? INVALID_FACTOR : 1;
  const raw = clamp01(location * read * interpretation.confidence * legible * checks);
  if (confidenceMap) scores.raw = round3(raw);
  // A shipped map may read a weighted product instead (each factor to its fitted power); scores.raw stays the plain
  // product, which is what `formglean calibrate` fits a field's own map on.
  const weights = input.factorWeights;
  const mapped = weights
    ? clamp01(location ** weights.location * read ** weights.ocr * clamp01(interpretation.confidence) ** weights.value * legible ** weights.legibility * checks ** weights.checks)
    : raw;
  if (confidenceMap && weights) scores.weighted = round3(mapped);
  // Not rounded to 3 decimals when mapped: a map's levels near 1 differ in the fourth (0.9968 vs 0.9991).
  const confidence = confidenceMap ? clamp01(applyConfidenceMap(confidenceMap, round3(mapped))) : round3(raw);
  reasons.push(...interpretation.reasons);

  let status: FieldScore['status'];
  if (blank) status = required ? 'missing' : confidence < reviewThreshold ? 'review' : 'accepted';
  else if (interpretation.outcome === 'invalid') status = 'invalid';
  else if (interpretation.outcome === 'ambiguous') status = 'review';
  else status = confidence < reviewThreshold ? 'review' : 'accepted';
  if (status === 'missing') reasons.push('required_empty');
  if (status === 'review' && reasons.length === 0) reasons.push('below_review_threshold');
  return { status, confidence, reasons: unique(reasons), scores };
}

/** Why a field was not read at all: its page is not in the file, its page does not fit the layout, or its box lies off the page. */
export type UnreadCause = 'page_missing' | 'page_not_aligned' | 'off_page';

/**
 * The status of a field that was not read. A page the file does not have leaves a required field missing (nothing
 * is there to review); a page that was there but could not be read in place goes to a person.
 */
export function unreadStatus(cause: UnreadCause, required: boolean): ReadStatus {
  return cause === 'page_missing' && required ? 'missing' : 'review';
}

/** A form whose layout is unknown (no schema fits it well): none of its fields is accepted, whatever it read. */
export function statusInUnknownLayout(status: FieldStatus): FieldStatus {
  return status === 'accepted' ? 'review' : status;
}
