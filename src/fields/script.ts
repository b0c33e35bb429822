import { z } from 'zod';
import type { Reading } from './types.js';
import model from './script-model.json' with { type: 'json' };
import type { Script } from '../result/document.js';

/** What src/read/script-measures.ts measures on an entry's ink (each member explained there). */
export interface ScriptMeasures {
  strokeSpread: number;
  /** Null with fewer than MIN_GLYPHS glyphs: the spread of one or two heights is noise. */
  heightSpread: number | null;
  /** Null with fewer than MIN_GLYPHS glyphs. */
  baselineSpread: number | null;
  heightShare: number;
  strokeShare: number;
  axisShare: number;
  aspect: number;
  components: number;
}


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
    /**
     * The form's other entries as evidence: one person usually fills one form with one pen (or one typewriter), so
     * the final log-odds are field × the entry's own log-odds + form × the median log-odds of the form's measured
     * entries + bias, when the form has at least minFields of them (else the entry's own log-odds alone).
     */
    context: z
      .object({ field: z.number(), form: z.number(), bias: z.number(), minFields: z.number().int().min(1) })
      .strict()
      .optional(),
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

/** The entry's own log-odds of handwriting under a model (its measures alone). */
export function entryLogOdds(inputs: ScriptInputs, m: ScriptModel = SHIPPED_SCRIPT_MODEL): number {
  let z = m.bias;
  m.features.forEach((f, i) => {
    const v = inputs[f];
    if (v !== null && Number.isFinite(v)) z += (m.weights[i] * (v - m.mean[i])) / m.scale[i];
  });
  return z;
}

const sigmoid = (z: number) => 1 / (1 + Math.exp(-z));

/** P(handwritten) of an entry on its own measures. */
export function handwritingProbability(inputs: ScriptInputs, m: ScriptModel = SHIPPED_SCRIPT_MODEL): number {
  return sigmoid(entryLogOdds(inputs, m));
}

/** Median of the entries' own log-odds, when there are enough of them for the model's context; else null. */
export function formLogOdds(own: readonly number[], m: ScriptModel = SHIPPED_SCRIPT_MODEL): number | null {
  if (!m.context || own.length < m.context.minFields) return null;
  const s = [...own].sort((a, b) => a - b);
  const k = s.length >> 1;
  return s.length % 2 ? s[k] : (s[k - 1] + s[k]) / 2;
}

export interface ScriptDecision {
  script: Script;
  /** P(handwritten), 0..1, rounded to 3 decimals: the evidence the decision stands on. */
  handwriting: number;
}

/** The decision for one entry, with the form's median log-odds (formLogOdds) when known. */
export function decideScript(inputs: ScriptInputs, m: ScriptModel = SHIPPED_SCRIPT_MODEL, form: number | null = null): ScriptDecision {
  const own = entryLogOdds(inputs, m);
  const z = m.context && form !== null ? m.context.field * own + m.context.form * form + m.context.bias : own;
  const p = sigmoid(z);
  return { script: p >= m.threshold ? 'handwritten' : 'printed', handwriting: Math.round(p * 1000) / 1000 };
}

/** Decisions for every entry of one form (null where nothing was measured), each with the form as context. */
export function decideScripts(entries: readonly (ScriptInputs | null)[], m: ScriptModel = SHIPPED_SCRIPT_MODEL): (ScriptDecision | undefined)[] {
  const own = entries.flatMap((e) => (e ? [entryLogOdds(e, m)] : []));
  const form = formLogOdds(own, m);
  return entries.map((e) => (e ? decideScript(e, m, form) : undefined));
}
