import { z } from 'zod';
import { confidenceMapProblem, type ConfidenceMapPoints } from './confidence-map.js';
import type { Script } from '../result/document.js';
import type { FactorWeights } from './scoring.js';
import shipped from './default-confidence.json' with { type: 'json' };

/**
 * The shipped confidence maps and review thresholds: one per field type and script, so that a schema nobody has
 * calibrated (a new layout, drafted by `schema from-pdf`) starts with confidences that mean what they say. Fitted by
 * bench/fit-default-confidence.ts on the development half of the real-form bench and on generated development
 * pages (the file's note gives the exact run); `formglean calibrate` still writes per-field maps into a schema,
 * and a field's own map takes precedence.
 *
 * Keys are "<group>/<type>", group being the entry's script (printed, handwritten), or "none" for fields with no
 * script decision (marks, signatures, blank areas, too little ink to measure); "<group>/*" pools a group's types
 * for a type with too few samples of its own. "<group>/digit_cells" is for a comb whose value the digit reader gave
 * (read cell by cell: src/pipeline/digit-cross-check.ts), whatever the field's type: its reading factor is the digit
 * reader's per-cell probabilities, which mean something else than Tesseract's word confidences (fitted apart by
 * bench/fit-digit-confidence.ts).
 */
export type ScriptGroup = Script | 'none';

/** Which reader's value a field holds, where it has a map of its own: the digit reader's, read cell by cell. */
export type CalibrationReader = 'digit_cells';

const Entry = z
  .object({
    points: z.array(z.tuple([z.number().min(0).max(1), z.number().min(0).max(1)])).min(1),
    /** Review threshold on the mapped confidence (an accuracy). */
    threshold: z.number().min(0).max(1),
    samples: z.number().int().min(0),
    errors: z.number().int().min(0),
  })
  .strict()
  .superRefine((e, ctx) => {
    const problem = confidenceMapProblem(e.points);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });

const Weights = z
  .object({ location: z.number().min(0), ocr: z.number().min(0), value: z.number().min(0), legibility: z.number().min(0), checks: z.number().min(0) })
  .strict();

export const DefaultConfidence = z
  .object({
    note: z.string(),
    /**
     * Per script group: the powers of the confidence factors (src/fields/scoring.ts) in the product the group's maps
     * read, from a logistic regression of rightness on the factors' logarithms (negative powers set to 0: no factor
     * may count against a field). Absent for a group: the plain product.
     */
    factorWeights: z.record(z.string(), Weights).default({}),
    /** Error among accepted fields each group's thresholds were chosen for. */
    targetError: z.record(z.string(), z.number()),
    maps: z.record(z.string(), Entry),
  })
  .strict();
export type DefaultConfidence = z.input<typeof DefaultConfidence>;

export const SHIPPED_CONFIDENCE = DefaultConfidence.parse(shipped);

/** Review threshold of a field scored on its raw confidence: no map of its own, none shipped (common practice). */
export const DEFAULT_REVIEW_THRESHOLD = 0.75;

export interface FieldCalibrationChoice {
  map?: ConfidenceMapPoints;
  threshold: number;
  /** Where the map came from: the schema field's own (calibrate), the shipped default for its type and script, or none. */
  from: 'field' | 'shipped' | 'none';
  /** The factor powers a shipped map reads (absent: the plain product). */
  factorWeights?: FactorWeights;
}

/**
 * The map and threshold a field is scored with. A field's own map (and threshold, else the schema's default, else
 * DEFAULT_REVIEW_THRESHOLD) comes first; otherwise the shipped map for its script and reader (the digit reader's,
 * where the table has one), else for its script and type, else its script's pool, with the shipped threshold,
 * unless the schema sets a threshold (on the field, or in its defaults), which then applies to the mapped confidence.
 */
export function chooseCalibration(
  field: { type: string; confidenceMap?: ConfidenceMapPoints; reviewThreshold?: number; reader?: CalibrationReader },
  group: ScriptGroup,
  schemaThreshold: number | undefined,
  table: DefaultConfidence = SHIPPED_CONFIDENCE,
): FieldCalibrationChoice {
  const set = field.reviewThreshold ?? schemaThreshold;
  if (field.confidenceMap) return { map: field.confidenceMap, threshold: set ?? DEFAULT_REVIEW_THRESHOLD, from: 'field' };
  const entry = (field.reader ? table.maps[`${group}/${field.reader}`] : undefined) ?? table.maps[`${group}/${field.type}`] ?? table.maps[`${group}/*`];
  if (!entry) return { threshold: set ?? DEFAULT_REVIEW_THRESHOLD, from: 'none' };
  const weights = table.factorWeights?.[group];
  return { map: entry.points, threshold: set ?? entry.threshold, from: 'shipped', ...(weights ? { factorWeights: weights } : {}) };
}
