/**
 * Fit the shipped confidence map of comb values the digit reader gave (src/fields/default-confidence.json, key
 * "handwritten/digit_cells"; src/pipeline/field-result.ts picks it) from real-form comb runs:
 *
 *   npx tsx bench/real-form-combs.ts --half dev --count 30 --seed 930000 --arms digits --out OUT/fit
 *   npx tsx bench/fit-digit-confidence.ts --runs OUT/fit [--judge OUT/held-out] [--write]
 *
 * A run folder is what bench/real-form-combs.ts writes (samples/<form>/truth, results-digits/<form>). Samples: the
 * digit combs holding digits on the page (as that bench scores them) whose value the digit reader gave or both
 * readers gave (details.digitCells: kept "digits", or agreed), entries judged handwritten. Each sample's raw
 * confidence is the weighted product the shipped handwritten maps read (scores.weighted: the digit reader's
 * per-cell probabilities are its reading factor), its label whether the normalized value equals the truth (the
 * MNIST labels of the digits written). Isotonic map and review threshold by formglean's own calibration
 * (src/eval/calibration-thresholds.ts) for the handwritten target error among accepted fields (1 %, as for the other
 * handwritten maps), each level shrunk by the handwritten maps' Beta prior (10 fields). With --judge, the fitted map
 * and threshold are applied to other runs (forms and pages never fitted on) and what they accept is printed.
 * Prints no field values.
 */
import { readFile, readdir } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { applyConfidenceMap } from '../src/fields/confidence-map.js';
import { DefaultConfidence } from '../src/fields/default-confidence.js';
import { proposeThresholds, type CalibrationSample } from '../src/eval/calibration-thresholds.js';
import { schemaCalibration } from '../src/eval/calibration-run.js';
import { loadScoreInputs } from '../src/eval/score-run.js';
import { scoreAll } from '../src/eval/score.js';
import { writeJsonAtomic } from '../src/io/atomic-write.js';
import { valueFromDigitCells } from '../src/pipeline/digit-cross-check.js';
import { isWrittenDigitComb } from './digit-comb-truth.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const KEY = 'handwritten/digit_cells';

const { values: args } = parseArgs({
  options: {
    runs: { type: 'string' },
    judge: { type: 'string' },
    target: { type: 'string', default: '0.01' },
    prior: { type: 'string', default: '10' },
    write: { type: 'boolean', default: false },
  },
});
if (!args.runs) throw new Error('--runs: one or more bench/real-form-combs.ts output folders, comma-separated');

interface Sample extends CalibrationSample {
  form: string;
}

/** The digit-reader samples of one real-form-combs output folder. */
async function samplesOf(run: string): Promise<Sample[]> {
  const out: Sample[] = [];
  for (const form of (await readdir(path.join(run, 'results-digits'))).sort()) {
    const truthDir = path.join(run, 'samples', form, 'truth');
    const inputs = await loadScoreInputs(path.join(run, 'results-digits', form), truthDir);
    const written = new Set<string>();
    for (const [doc, t] of inputs.truth) for (const f of t.fields) if (isWrittenDigitComb(f)) written.add(`${doc}\u0000${f.name}`);
    const scored = new Map(scoreAll({ ...inputs, bins: 10 }).items.map((i) => [`${i.document}\u0000${i.field}`, i]));
    for (const [doc, r] of inputs.results) {
      for (const f of r.fields) {
        const key = `${doc}\u0000${f.name}`;
        const item = scored.get(key);
        if (!written.has(key) || !item || f.script !== 'handwritten' || !valueFromDigitCells(f.details)) continue;
        const raw = (f.scores as Record<string, number>).weighted ?? (f.scores as Record<string, number>).raw;
        out.push({ field: KEY, type: 'digit_cells', confidence: raw, correct: item.correct, decidable: item.decidable, form });
      }
    }
  }
  return out;
}

const fitOn = (await Promise.all(args.runs.split(',').map(samplesOf))).flat();
const target = Number(args.target);
const proposal = proposeThresholds(fitOn, { targetError: target, minSamples: 1, priorStrength: Number(args.prior) });
const fitted = proposal.fields.find((f) => f.field === KEY);
if (!fitted) throw new Error(`no digit-reader samples in ${args.runs}`);
const c = schemaCalibration(fitted);
const pct = (a: number, b: number) => (b ? `${((100 * a) / b).toFixed(1)} %` : '-');
process.stdout.write(
  `fitted on ${fitOn.length} comb values (${fitOn.filter((s) => !s.correct).length} wrong) from ${[...new Set(fitOn.map((s) => s.form))].join(', ')}\n` +
    `map ${JSON.stringify(c.confidenceMap)}; raw threshold ${fitted.threshold.toFixed(3)}, mapped ${c.reviewThreshold}; ` +
    `in-sample accepted ${pct(fitted.accepted, fitted.samples)}, ${fitted.acceptedErrors} wrong\n`,
);

if (args.judge) {
  const judged = (await Promise.all(args.judge.split(',').map(samplesOf))).flat();
  for (const form of [...new Set(judged.map((s) => s.form)), 'all']) {
    const of = judged.filter((s) => form === 'all' || s.form === form);
    const acc = of.filter((s) => s.decidable && applyConfidenceMap(c.confidenceMap, s.confidence) >= c.reviewThreshold);
    process.stdout.write(`judged ${form}: ${of.length} values, ${pct(of.filter((s) => s.correct).length, of.length)} right, accepted ${pct(acc.length, of.length)}, wrong among accepted ${acc.filter((s) => !s.correct).length}/${acc.length}\n`);
  }
}

if (args.write) {
  const file = path.join(ROOT, 'src', 'fields', 'default-confidence.json');
  // The file as it stands (its key order kept), checked before and after.
  const table = JSON.parse(await readFile(file, 'utf8')) as DefaultConfidence;
  DefaultConfidence.parse(table);
  table.maps[KEY] = { points: c.confidenceMap, threshold: c.reviewThreshold, samples: fitted.samples, errors: fitted.errors };
  DefaultConfidence.parse(table);
  await writeJsonAtomic(file, table);
  process.stdout.write(`wrote ${KEY} into ${path.relative(ROOT, file)}\n`);
}
