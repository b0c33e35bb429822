import { z } from 'zod';

/** Version of the result JSON contract; bump on breaking changes. */
export const RESULT_FORMAT = 1;

export const FieldStatus = z.enum(['accepted', 'review', 'missing', 'invalid', 'corrected', 'confirmed']);
export type FieldStatus = z.infer<typeof FieldStatus>;

/** The statuses reading gives a field; corrected and confirmed come only from a person's review. */
export const ReadStatus = FieldStatus.exclude(['corrected', 'confirmed']);
export type ReadStatus = z.infer<typeof ReadStatus>;

/** Whether an entry is machine-printed or handwritten (decided in src/fields/script.ts). */
export const Script = z.enum(['printed', 'handwritten']);
export type Script = z.infer<typeof Script>;

/** Where a field's box came from: a detection, or the schema region after alignment; none when neither. */
export const FieldSource = z.enum(['detection', 'region', 'none']);
export type FieldSource = z.infer<typeof FieldSource>;

/**
 * Page indexes in records count from 0 (page 1 of the form is 0), as in the arrays they index; everything shown to
 * people (the review queue's page column, --page options, messages) counts from 1.
 */
export const ResultBox = z.object({
  page: z.number().int().min(0),
  x: z.number(),
  y: z.number(),
  w: z.number(),
  h: z.number(),
});
export type ResultBox = z.infer<typeof ResultBox>;

const Value = z.union([z.string(), z.number(), z.boolean(), z.array(z.string()), z.null()]);

export const FieldResult = z.object({
  name: z.string(),
  type: z.string(),
  page: z.number().int().min(0),
  /** Normalized value (ISO 8601 date, E.164 phone, true/false for a checkbox, ...); for an `invalid` field, the text read. */
  value: Value,
  /** What OCR returned before normalization (null for mark-read fields). */
  raw: z.string().nullable(),
  extra: z.record(z.string(), z.union([z.string(), z.number(), z.boolean()])).optional(),
  status: FieldStatus,
  confidence: z.number().min(0).max(1),
  reasons: z.array(z.string()),
  /** Where the field was read, in source pixels of the (un-rotated) input page. */
  box: ResultBox.nullable(),
  source: FieldSource,
  /** Whether the entry is machine-printed or handwritten (src/fields/script.ts); absent for marks, signatures, blank
   *  areas, and in records written before the decision existed. */
  script: Script.optional(),
  /** The decision's evidence: P(handwritten), 0..1. */
  scriptEvidence: z.number().min(0).max(1).optional(),
  /** Which confidence map stated the confidence: the schema field's own, the shipped one for its type and script,
   *  or none (raw). Absent in records written before shipped maps existed. */
  calibration: z.enum(['field', 'shipped', 'none']).optional(),
  /** Component scores that make up the confidence, each 0..1. */
  scores: z.record(z.string(), z.number()),
  /** Per-part details: fill ratios of a choice group's boxes, cleanup variants tried, ... */
  details: z.record(z.string(), z.unknown()).optional(),
  /** Set when a person corrected or confirmed the value through the review queue. */
  review: z
    .object({
      previousValue: Value,
      previousStatus: FieldStatus,
      /** The extra forms the value had before (restored when the answer is undone). */
      previousExtra: z.record(z.string(), z.union([z.string(), z.number(), z.boolean()])).optional(),
      reviewer: z.string(),
      at: z.string(),
      note: z.string().optional(),
    })
    .optional(),
});
export type FieldResult = z.infer<typeof FieldResult>;

export const PageResult = z.object({
  /** Page of the form (0-based), as the schema numbers them. */
  index: z.number().int().min(0),
  /** Page of the file it came from, when the file holds several forms. */
  filePage: z.number().int().min(0).optional(),
  width: z.number().int(),
  height: z.number().int(),
  /** Clockwise rotation in degrees (0, 90, 180, 270) applied to make the page upright. */
  rotation: z.number(),
  /** Estimated skew in degrees that was corrected. */
  skew: z.number(),
  /** Page-to-reference alignment: method, affine transform, residual in reference pixels. */
  alignment: z
    .object({
      method: z.string(),
      transform: z.object({ a: z.number(), b: z.number(), c: z.number(), d: z.number(), e: z.number(), f: z.number() }),
      residual: z.number().nullable(),
      matched: z.number().int(),
      /** 0..1 quality of the fit (image correlation, or share of regions matched). */
      score: z.number().optional(),
    })
    .nullable(),
  detections: z.number().int(),
});
export type PageResult = z.infer<typeof PageResult>;

export const Identified = z.object({ id: z.string(), path: z.string(), sha256: z.string() });

/**
 * What a reviewer said of a document whose layout was unknown: it is the form it was read as (confirmed), it is
 * another of the given forms (other_form, naming it: read it again with that schema), or none of them (not_a_form).
 */
export const LayoutDecision = z.enum(['confirmed', 'other_form', 'not_a_form']);
export type LayoutDecision = z.infer<typeof LayoutDecision>;

export const LayoutReview = z.object({
  decision: LayoutDecision,
  /** The form named by the reviewer, for other_form. */
  schema: z.string().optional(),
  reviewer: z.string(),
  at: z.string(),
  note: z.string().optional(),
});
export type LayoutReview = z.infer<typeof LayoutReview>;

export const DocumentResult = z.object({
  format: z.literal(RESULT_FORMAT),
  document: Identified,
  schema: z.object({ name: z.string(), version: z.string(), path: z.string(), sha256: z.string() }),
  model: Identified,
  /**
   * Which schema the document was assigned to when several were given, with every candidate's score; for a layout
   * found unknown, the fields held back for it and a person's answer (which form it is).
   */
  layout: z
    .object({
      status: z.enum(['assigned', 'unknown_layout']),
      score: z.number(),
      candidates: z.array(z.object({ schema: z.string(), score: z.number() })),
      /** Fields that read well enough to be accepted but were held for review because the layout was unknown. */
      heldBack: z.array(z.string()).optional(),
      /** A person's answer to "which form is this?" for a document of unknown layout (review/layout-answer.ts). */
      review: LayoutReview.optional(),
    })
    .optional(),
  createdAt: z.string(),
  pages: z.array(PageResult),
  fields: z.array(FieldResult),
  counts: z.record(FieldStatus, z.number().int()),
  seconds: z.number(),
});
export type DocumentResult = z.infer<typeof DocumentResult>;

export function countStatuses(fields: readonly FieldResult[]): Record<FieldStatus, number> {
  const counts = Object.fromEntries(FieldStatus.options.map((s) => [s, 0])) as Record<FieldStatus, number>;
  for (const f of fields) counts[f.status]++;
  return counts;
}
