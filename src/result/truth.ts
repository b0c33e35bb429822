import { z } from 'zod';

/**
 * Truth files: what was drawn on a labeled page (`samples generate`, `samples fill`, the benches), one JSON per page
 * image in DIR/truth/<stem>.json. The generator writes them and `score`/`calibrate` read them; this is the one
 * definition both use.
 */
const BoxTuple = z.tuple([z.number(), z.number(), z.number(), z.number()]);

export const TruthFill = z.enum(['typed', 'handwriting', 'blank']);
export type TruthFill = z.infer<typeof TruthFill>;

export const TruthField = z.object({
  name: z.string(),
  /** Field type name (src/fields/registry.ts). */
  type: z.string(),
  /** Detector class of the field's entry area. */
  class: z.string(),
  page: z.number().int().min(0),
  /** Normalized as results give it (ISO date, E.164 phone, number, boolean, choice value(s)); null when blank. */
  value: z.union([z.string(), z.number(), z.boolean(), z.array(z.string()), z.null()]),
  /** As written on the page; lines of a multi-line area joined by "\n"; null for marks, signatures, blanks. */
  text: z.string().nullable(),
  /** [x, y, w, h] in page pixels; for a choice group, the bounds of all its boxes. */
  box: BoxTuple,
  /** Checkbox: the mark drawn in the box (src/synth/checkbox-mark.ts). */
  mark: z.string().optional(),
  /** Choice: each printed box, with whether it was ticked and the mark drawn. */
  parts: z.array(z.object({ key: z.string(), box: BoxTuple.optional(), mark: z.string().optional(), checked: z.boolean() })).optional(),
});
export type TruthField = z.infer<typeof TruthField>;

export const TruthDocument = z.object({
  layout: z.string(),
  /** Style family of a generated layout. */
  family: z.string().optional(),
  seed: z.number(),
  index: z.number().int(),
  /** The page image's file name. */
  file: z.string().optional(),
  width: z.number(),
  height: z.number(),
  dpi: z.number().optional(),
  /** 0 or 180 (an upside-down feed). */
  rotation: z.number(),
  /** Small rotation in degrees, positive = clockwise on screen. */
  skew: z.number(),
  fill: TruthFill,
  /** Typed font or handwriting-style font family key used by the writer; null on blank pages. */
  pen: z.string().nullable().optional(),
  fields: z.array(TruthField),
});
export type TruthDocument = z.infer<typeof TruthDocument>;
