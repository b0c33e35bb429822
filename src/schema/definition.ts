import { z } from 'zod';
import { confidenceMapProblem } from '../fields/confidence-map.js';
import { FIELD_TYPES, fieldTypeNames } from '../fields/registry.js';

/** [x, y, w, h] in pixels of the reference page. */
export const Region = z
  .tuple([z.number().min(0), z.number().min(0), z.number().positive(), z.number().positive()])
  .describe('[x, y, width, height] in pixels of the reference page');

/** Padding around a located area before reading: pixels, or a share of the box's shorter side as "N%". */
export const Padding = z
  .union([z.number().min(0), z.string().regex(/^\d+(\.\d+)?%$/, 'a percentage such as "10%"')])
  .describe('Pixels added on every side before reading, or "N%" of the box\'s shorter side');

export const OcrHints = z
  .object({
    mode: z.enum(['line', 'block', 'word', 'char']).optional().describe('line: one text line; block: several lines'),
    allowed: z.string().min(1).optional().describe('The only characters OCR may return'),
  })
  .strict();

export const ConfidenceMap = z
  .array(z.tuple([z.number().min(0).max(1), z.number().min(0).max(1)]))
  .min(1)
  .superRefine((points, ctx) => {
    const problem = confidenceMapProblem(points);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  })
  .describe(
    'Raw confidence to observed accuracy, [[x, y], ...]: from raw confidence x upward the field is right with ' +
      'probability y (written by formglean calibrate). With a map, reviewThreshold applies to the mapped confidence.',
  );

const slug = z.string().regex(/^[a-z][a-z0-9_]*$/, 'a lower-case name: letters, digits and _');

const FieldCommon = {
  name: slug.describe('Unique field name; becomes the key in results'),
  label: z.string().optional().describe('The printed label, for people and reports'),
  page: z.number().int().min(0).default(0).describe('Page index (0-based) of the form'),
  class: z.string().min(1).describe('Detector class that finds this field'),
  region: Region.optional(),
  padding: Padding.optional(),
  required: z.boolean().default(false),
  ocr: OcrHints.optional(),
  cells: z
    .number()
    .int()
    .min(1)
    .optional()
    .describe('A comb\'s number of boxes, one character each: the boxes are cut evenly where no printed separator is found'),
  reviewThreshold: z.number().min(0).max(1).optional().describe('Confidence under which the field goes to review'),
  confidenceMap: ConfidenceMap.optional(),
};

function fieldVariant(t: (typeof FIELD_TYPES)[number]) {
  return z
    .object({
      ...FieldCommon,
      type: z.literal(t.name).describe(t.description),
      options: (t.options as z.ZodType).optional(),
    })
    .strict();
}

const variants = FIELD_TYPES.map(fieldVariant);

export const FieldSpec = z.discriminatedUnion('type', variants as unknown as [ReturnType<typeof fieldVariant>], {
  error: (iss) =>
    iss.code === 'invalid_union' ? `unknown field type; known types: ${fieldTypeNames().join(', ')}` : undefined,
});

export const ReferencePage = z
  .object({
    width: z.number().int().positive(),
    height: z.number().int().positive(),
    image: z.string().optional().describe('Blank form image of this page (path relative to the schema file)'),
  })
  .strict();

export const FormSchema = z
  .object({
    $schema: z.string().optional(),
    form: z
      .object({
        name: z.string().min(1),
        version: z.string().min(1),
        description: z.string().optional(),
      })
      .strict(),
    pages: z.array(ReferencePage).min(1).describe('The reference layout: one entry per page, in pixels'),
    defaults: z
      .object({
        padding: Padding.default(4),
        reviewThreshold: z
          .number()
          .min(0)
          .max(1)
          .optional()
          .describe(
            'Confidence under which a field goes to review, for every field without its own. Absent: the shipped ' +
              'threshold of the field\'s type and script (src/fields/default-confidence.json), or 0.75 on the raw confidence.',
          ),
      })
      .strict()
      .default({ padding: 4 }),
    fields: z.array(FieldSpec).min(1),
  })
  .strict();

export type FormSchema = z.infer<typeof FormSchema>;
export type FieldSpec = z.infer<typeof FieldSpec>;
export type RegionTuple = z.infer<typeof Region>;
