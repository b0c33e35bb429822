import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { configError } from '../errors.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import type { DocumentResult } from '../result/document.js';
import { parseSchemaText } from '../schema/load.js';
import type { FormSchema } from '../schema/definition.js';
import {
  proposeThresholds,
  type CalibrationSample,
  type FieldCalibration,
  type ThresholdProposal,
} from './calibration-thresholds.js';
import { roundLevel, withCalibration, type SchemaFieldCalibration } from './calibration-schema.js';
import { applyIsotonic } from './calibration.js';
import { DEFAULT_BINS } from './reliability.js';
import { loadScoreInputs } from './score-run.js';
import { scoreAll, type ScoredField } from './score.js';

export interface CalibrateOptions {
  results: string;
  truth: string;
  schema: string;
  targetError: number;
  /** Calibrated schema copy; default <schema stem>.calibrated<ext> beside the schema. */
  out?: string;
  /** Optional JSON file with the fitted confidence-to-accuracy maps. */
  map?: string;
  minSamples?: number;
}

export interface CalibrateRun {
  proposal: ThresholdProposal;
  /** What was written into the schema copy, per field. */
  fields: Map<string, SchemaFieldCalibration>;
  /** Thresholds the schema had before, per field (field's own, else the schema default). */
  current: Map<string, number>;
  out: string;
  documents: number;
}

/** Fewest samples for a map of a field's own (else its type's, else all): below ~100 a handful of errors decides
 *  the whole fit (common practice to pool sparse groups; the number is a judgement, not a measurement). */
export const DEFAULT_MIN_SAMPLES = 100;

export function calibrationSamples(items: readonly ScoredField[]): CalibrationSample[] {
  return items.map((i) => ({
    field: i.field,
    type: i.type,
    confidence: i.rawConfidence,
    correct: i.correct,
    decidable: i.decidable,
  }));
}

/**
 * What goes into the calibrated schema for one field: its confidence map (the isotonic levels as [from, accuracy]
 * points) and its review threshold on the mapped scale, i.e. the accuracy of the lowest accepted level. Levels of a
 * fit strictly increase, so "mapped confidence >= that accuracy" accepts exactly the levels the proposal accepted
 * (two levels that round to the same 4 decimals become one). A field with nothing accepted gets threshold 1.
 */
export function schemaCalibration(f: FieldCalibration): SchemaFieldCalibration {
  // Under the lowest confidence the fit saw, nothing is known: accuracy 0 there sends such a reading to review,
  // as the raw threshold (never below the lowest level's lower end) does.
  const map: [number, number][] = f.map.steps[0].from > 0 ? [[0, 0]] : [];
  for (const step of f.map.steps) {
    const point: [number, number] = [roundLevel(step.from), roundLevel(step.value)];
    const last = map[map.length - 1];
    if (last && last[1] === point[1]) continue; // equal after rounding: one level
    if (last && last[0] === point[0]) last[1] = point[1];
    else map.push(point);
  }
  const reviewThreshold = f.accepted > 0 ? roundLevel(applyIsotonic(f.map, f.threshold)) : 1;
  return { reviewThreshold, confidenceMap: map };
}

/**
 * Fit maps and thresholds for one schema on scored labeled fields (those of fields the schema has): the proposal,
 * what to write per field, and how many documents it rests on.
 */
export function calibrateItems(
  items: readonly ScoredField[],
  schema: FormSchema,
  options: { targetError: number; minSamples: number },
): { proposal: ThresholdProposal; fields: Map<string, SchemaFieldCalibration>; documents: number } {
  const known = new Set(schema.fields.map((f) => f.name));
  const used = items.filter((i) => known.has(i.field));
  const proposal = proposeThresholds(calibrationSamples(used), options);
  const fields = new Map(proposal.fields.map((f) => [f.field, schemaCalibration(f)]));
  return { proposal, fields, documents: new Set(used.map((i) => i.document)).size };
}

export function defaultCalibratedPath(schemaFile: string): string {
  const p = path.parse(schemaFile);
  return path.join(p.dir, `${p.name}.calibrated${p.ext}`);
}

export async function runCalibrate(options: CalibrateOptions): Promise<CalibrateRun> {
  const { targetError } = options;
  if (!(targetError >= 0 && targetError < 1)) {
    throw configError(undefined, `--target-error must be a share in [0, 1), e.g. 0.005; got ${targetError}`);
  }
  const minSamples = options.minSamples ?? DEFAULT_MIN_SAMPLES;
  if (!Number.isInteger(minSamples) || minSamples < 1) {
    throw configError(undefined, `--min-samples must be a positive integer, got ${minSamples}`);
  }
  let text: string;
  try {
    text = await readFile(options.schema, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw configError(options.schema, code === 'ENOENT' ? 'schema file not found' : `cannot read schema file (${code})`);
  }
  const schema = parseSchemaText(text, options.schema);
  const inputs = await loadScoreInputs(options.results, options.truth);
  // Only documents this schema read: a results folder may mix forms.
  const results = new Map<string, DocumentResult>(
    [...inputs.results].filter(([, r]) => r.schema.name === schema.form.name),
  );
  const truth = new Map([...inputs.truth].filter(([stem]) => results.has(stem)));
  if (truth.size === 0) {
    throw configError(options.results, `no results of form "${schema.form.name}" with matching truth in ${options.truth}`);
  }
  const { items } = scoreAll({ truth, results, failed: new Set(), bins: DEFAULT_BINS });
  const { proposal, fields } = calibrateItems(items, schema, { targetError, minSamples });

  const current = new Map(schema.fields.map((f) => [f.name, f.reviewThreshold ?? schema.defaults.reviewThreshold]));
  const note =
    ` reviewThreshold values calibrated by formglean calibrate on ${truth.size} labeled documents, ` +
    `target error among accepted fields ${targetError} (${new Date().toISOString().slice(0, 10)}); with a ` +
    `confidenceMap the threshold is on the mapped scale (the accuracy observed at the raw confidence)`;
  const out = options.out ?? defaultCalibratedPath(options.schema);
  if (path.resolve(out) === path.resolve(options.schema)) {
    throw configError(out, 'refusing to overwrite the input schema; name another --out');
  }
  const copy = withCalibration(text, options.schema, fields, note);
  parseSchemaText(copy, out); // the copy must still be a valid schema before it is written
  await writeFileAtomic(out, copy);
  if (options.map) {
    await writeJsonAtomic(options.map, {
      format: 1,
      schema: { name: schema.form.name, version: schema.form.version },
      targetError,
      documents: truth.size,
      fields: Object.fromEntries(
        proposal.fields.map((f) => [f.field, { type: f.type, scope: f.scope, threshold: f.threshold, steps: f.map.steps }]),
      ),
    });
  }
  return { proposal, fields, current, out, documents: truth.size };
}
