import { readFile } from 'node:fs/promises';
import { DEFAULT_REVIEW_THRESHOLD } from '../fields/default-confidence.js';
import path from 'node:path';
import { configError } from '../errors.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import type { DocumentResult } from '../result/document.js';
import { parseSchemaText } from '../schema/load.js';
import type { FormSchema } from '../schema/definition.js';
import {
  proposeThresholds,
  type FieldCalibration,
  type ThresholdProposal,
} from './calibration-thresholds.js';
import { roundLevel, withCalibration, type SchemaFieldCalibration } from '../schema/calibration-yaml.js';
import { applyIsotonic } from './calibration.js';
import { DEFAULT_BINS } from './reliability.js';
import { reviewedSamples, type ReviewedSample } from './reviewed-labels.js';
import { loadResults } from './score-input.js';
import { loadScoreInputs, requireFolder } from './score-run.js';
import { scoreAll, type ScoredField } from './score.js';
import { checkTarget, type TargetCheck } from './target-check.js';

export interface CalibrateOptions {
  results: string;
  /** Truth folder of generated samples; without it, labels come from fields a person reviewed (reviewed-labels.ts). */
  truth?: string;
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
  /** Where the labels came from: the generator's truth, or review answers in the results. */
  labels: 'truth' | 'review';
  target: TargetCheck;
}

/** Fewest samples for a map of a field's own (else its type's, else all): below ~100 a handful of errors decides
 *  the whole fit (common practice to pool sparse groups; the number is a judgement, not a measurement). */
export const DEFAULT_MIN_SAMPLES = 100;

export function calibrationSamples(items: readonly ScoredField[]): ReviewedSample[] {
  return items.map((i) => ({
    document: i.document,
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
 * Fit maps and thresholds for one schema on labeled fields (those of fields the schema has): the proposal, what to
 * write per field, how many documents and labeled fields it rests on.
 */
export function calibrateSamples(
  samples: readonly ReviewedSample[],
  schema: FormSchema,
  options: { targetError: number; minSamples: number },
): { proposal: ThresholdProposal; fields: Map<string, SchemaFieldCalibration>; documents: number } {
  const known = new Set(schema.fields.map((f) => f.name));
  const used = samples.filter((i) => known.has(i.field));
  const proposal = proposeThresholds(used, options);
  const fields = new Map(proposal.fields.map((f) => [f.field, schemaCalibration(f)]));
  return { proposal, fields, documents: new Set(used.map((i) => i.document)).size };
}

/** calibrateSamples on fields scored against truth. */
export function calibrateItems(
  items: readonly ScoredField[],
  schema: FormSchema,
  options: { targetError: number; minSamples: number },
): { proposal: ThresholdProposal; fields: Map<string, SchemaFieldCalibration>; documents: number } {
  return calibrateSamples(calibrationSamples(items), schema, options);
}

/** Labeled fields of this schema's documents, from truth when given, else from review answers in the results. */
async function labeledSamples(options: CalibrateOptions, schema: FormSchema): Promise<ReviewedSample[]> {
  const formName = schema.form.name;
  if (options.truth) {
    const inputs = await loadScoreInputs(options.results, options.truth);
    // Only documents this schema read: a results folder may mix forms.
    const results = new Map<string, DocumentResult>([...inputs.results].filter(([, r]) => r.schema.name === formName));
    const truth = new Map([...inputs.truth].filter(([stem]) => results.has(stem)));
    if (truth.size === 0) {
      throw configError(options.results, `no results of form "${formName}" with matching truth in ${options.truth}`);
    }
    return calibrationSamples(scoreAll({ truth, results, failed: new Set(), bins: DEFAULT_BINS }).items);
  }
  await requireFolder(options.results, 'results');
  const results = new Map(
    [...(await loadResults(options.results))].filter(([, e]) => e.result.schema.name === formName).map(([k, e]) => [k, e.result]),
  );
  if (results.size === 0) throw configError(options.results, `holds no results of form "${formName}"`);
  return reviewedSamples(results);
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
  const labels = options.truth ? 'truth' : 'review';
  const known = new Set(schema.fields.map((f) => f.name));
  const samples = (await labeledSamples(options, schema)).filter((x) => known.has(x.field));
  // With fewer labels than one map needs, every map would be fitted on too few (fitMaps pools sparse fields into
  // their type, then into one map over all fields; that last map is the smallest any field can get).
  if (samples.length < minSamples) {
    const what = labels === 'truth' ? 'labeled fields' : 'reviewed fields (confirmed or corrected)';
    throw configError(
      options.results,
      `only ${samples.length} ${what} of form "${schema.form.name}"; at least ${minSamples} are needed to fit a ` +
        `confidence map (--min-samples); no thresholds written`,
    );
  }
  const { proposal, fields, documents } = calibrateSamples(samples, schema, { targetError, minSamples });
  const target = checkTarget(proposal);

  const current = new Map(schema.fields.map((f) => [f.name, f.reviewThreshold ?? schema.defaults.reviewThreshold ?? DEFAULT_REVIEW_THRESHOLD]));
  const note =
    ` reviewThreshold values calibrated by formglean calibrate on ${documents} ${labels === 'truth' ? 'labeled' : 'reviewed'} documents ` +
    `(${samples.length} labeled fields), ` +
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
      documents,
      labels,
      fields: Object.fromEntries(
        proposal.fields.map((f) => [f.field, { type: f.type, scope: f.scope, threshold: f.threshold, steps: f.map.steps }]),
      ),
    });
  }
  return { proposal, fields, current, out, documents, labels, target };
}
