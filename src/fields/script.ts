import { z } from 'zod';
import type { ScriptMeasures } from '../read/script-measures.js';
import type { Reading } from './types.js';
import model from './script-model.json' with { type: 'json' };

/** Whether an entry was machine-printed (typed into a PDF, a typewriter) or written by hand. */
export const Script = z.enum(['printed', 'handwritten']);
export type Script = z.infer<typeof Script>;

/** The inputs of the decision, in the model's order: the crop measures (src/read/script-measures.ts) and OCR's words. */
export const SCRIPT_FEATURES = ['strokeSpread', 'heightSpread', 'baselineSpread', 'heightShare', 'strokeShare', 'axisShare', 'aspect', 'wordConfidence'] as const;
export type ScriptFeature = (typeof SCRIPT_FEATURES)[number];

/**
 * A logistic model over standardized features: P(handwritten) = 1 / (1 + exp(-(bias + Σ w_i (x_i - mean_i) / scale_i))).
 * A missing feature (a spread of fewer than three glyphs) sits at its mean, i.e. adds nothing.
 */
export const ScriptModel = z
  .object({
    note: z.string(),
    features: z.array(z.enum(SCRIPT_FEATURES)),
    mean: z.array(z.number()),
    scale: z.array(z.number().positive()),
    weights: z.array(z.number()),
    bias: z.number(),
    /** P(handwritten) from which an entry counts as handwritten. */
    threshold: z.number().min(0).max(1),
  })
  .strict()
  .refine((m) => m.mean.length === m.features.length && m.scale.length === m.features.length && m.weights.length === m.features.length, {
    message: 'features, mean, scale and weights must have the same length',
  });
export type ScriptModel = z.infer<typeof ScriptModel>;

/** The shipped model (fitted by bench/fit-script-model.ts on generated pages; its note says which and how). */
export const SHIPPED_SCRIPT_MODEL: ScriptModel = ScriptModel.parse(model);

export type ScriptInputs = Record<ScriptFeature, number | null>;

/** The decision's inputs for one OCR-read field: its crop measures and the mean of OCR's word confidences. */
export function scriptInputs(measures: ScriptMeasures, reading: Reading | null): ScriptInputs {
  const words = reading?.kind === 'text' ? reading.words : [];
  return {
    strokeSpread: measures.strokeSpread,
    heightSpread: measures.heightSpread,
    baselineSpread: measures.baselineSpread,
    heightShare: measures.heightShare,
    strokeShare: measures.strokeShare,
    axisShare: measures.axisShare,
    aspect: measures.aspect,
    wordConfidence: words.length ? words.reduce((s, w) => s + w.confidence, 0) / words.length : null,
  };
}

/** P(handwritten) under a model. */
export function handwritingProbability(inputs: ScriptInputs, m: ScriptModel = SHIPPED_SCRIPT_MODEL): number {
  let z = m.bias;
  m.features.forEach((f, i) => {
    const v = inputs[f];
    if (v !== null && Number.isFinite(v)) z += (m.weights[i] * (v - m.mean[i])) / m.scale[i];
  });
  return 1 / (1 + Math.exp(-z));
}

export interface ScriptDecision {
  script: Script;
  /** P(handwritten), 0..1, rounded to 3 decimals: the evidence the decision stands on. */
  handwriting: number;
}

export function decideScript(inputs: ScriptInputs, m: ScriptModel = SHIPPED_SCRIPT_MODEL): ScriptDecision {
  const p = handwritingProbability(inputs, m);
  return { script: p >= m.threshold ? 'handwritten' : 'printed', handwriting: Math.round(p * 1000) / 1000 };
}
