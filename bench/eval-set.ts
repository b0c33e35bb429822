/**
 * `npm run eval`: the fixed labeled evaluation set, end to end.
 *
 *  1. generate, for each demo layout, typed and handwriting-style fills with light scan degradation, from seeds
 *     reserved for evaluation (>= 900000; training uses 1..99999), into out/eval/samples/<layout>-<fill>/
 *     (skipped when already there: pages depend only on seed and index);
 *  2. extract each layout with its demo schema into out/eval/results/<layout>/ (--resume keeps earlier results);
 *  3. score everything: the table, out/eval/score.json and the reliability diagram;
 *  4. calibrate review thresholds on the even-numbered pages of each layout and measure them on the odd ones
 *     (out/eval/calibrated/<layout>.yaml), then print the measured figures next to the targets.
 *
 * Options: --count N pages per layout and fill (default 20), --generate-only (prepare the set, stop),
 * --resume (reuse results of unchanged pages: only when the code has not changed since), --layouts a,b, --fills typed,handwriting,
 * --degrade none|light|heavy, --model FILE, --target-error 0.005, --out DIR, --per-field.
 */
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { runBatch } from '../src/batch/run-batch.js';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { writeFileAtomic, writeJsonAtomic } from '../src/io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { closeSharedOcrEngine } from '../src/read/ocr-engine.js';
import { loadSchema } from '../src/schema/load.js';
import { generateSamples } from '../src/synth/generate.js';
import type { FillMode } from '../src/synth/fill.js';
import type { LayoutName } from '../src/synth/layouts.js';
import type { DegradeLevel } from '../src/synth/scan-params.js';
import { calibrationSamples, DEFAULT_MIN_SAMPLES } from '../src/eval/calibration-run.js';
import { evaluateOnHoldout, type HoldoutEvaluation } from '../src/eval/calibration-holdout.js';
import { withReviewThresholds } from '../src/eval/calibration-schema.js';
import { DEFAULT_BINS } from '../src/eval/reliability.js';
import { runScore } from '../src/eval/score-run.js';
import { formatScore } from '../src/eval/score-table.js';
import type { Metrics } from '../src/eval/score.js';

const LAYOUTS = ['clinic-intake', 'marina-slip', 'garden-plot'] as const;
const FILLS = ['typed', 'handwriting'] as const;

/** Run seeds of the evaluation set, one per layout and fill; all >= 900000, the range reserved for evaluation. */
const EVAL_SEEDS: Record<(typeof LAYOUTS)[number], Record<(typeof FILLS)[number], number>> = {
  'clinic-intake': { typed: 900101, handwriting: 900102 },
  'marina-slip': { typed: 900201, handwriting: 900202 },
  'garden-plot': { typed: 900301, handwriting: 900302 },
};

const { values: args } = parseArgs({
  options: {
    count: { type: 'string', default: '20' },
    'generate-only': { type: 'boolean', default: false },
    resume: { type: 'boolean', default: false },
    layouts: { type: 'string', default: LAYOUTS.join(',') },
    fills: { type: 'string', default: FILLS.join(',') },
    degrade: { type: 'string', default: 'light' },
    model: { type: 'string', default: DEFAULT_MODEL_PATH },
    'target-error': { type: 'string', default: '0.005' },
    out: { type: 'string', default: 'out/eval' },
    'per-field': { type: 'boolean', default: false },
  },
});

function listOf<T extends string>(flag: string, value: string, allowed: readonly T[]): T[] {
  const items = value.split(',').map((s) => s.trim()).filter(Boolean);
  for (const v of items) {
    if (!(allowed as readonly string[]).includes(v)) throw new Error(`--${flag}: "${v}" is not one of ${allowed.join(', ')}`);
  }
  return items as T[];
}

const count = Number(args.count);
if (!Number.isInteger(count) || count < 2) throw new Error(`--count: expected a whole number >= 2, got "${args.count}"`);
const layouts = listOf('layouts', args.layouts!, LAYOUTS);
const fills = listOf('fills', args.fills!, FILLS);
const degrade = listOf('degrade', args.degrade!, ['none', 'light', 'heavy'] as const)[0] as DegradeLevel;
const targetError = Number(args['target-error']);
const outDir = path.resolve(args.out!);
const samplesDir = path.join(outDir, 'samples');
const resultsDir = path.join(outDir, 'results');

async function truthCount(dir: string): Promise<number> {
  try {
    return (await readdir(path.join(dir, 'truth'))).filter((f) => f.endsWith('.json')).length;
  } catch {
    return 0;
  }
}

const started = performance.now();
const say = (s: string): void => void process.stderr.write(`${s}\n`);

// 1. generate
for (const layout of layouts) {
  for (const fill of fills) {
    const dir = path.join(samplesDir, `${layout}-${fill}`);
    const seed = EVAL_SEEDS[layout][fill];
    if ((await truthCount(dir)) === count) continue;
    const g = await generateSamples({
      layout: layout as LayoutName,
      count,
      seed,
      out: dir,
      fill: fill as FillMode,
      degrade,
      styles: 'heldout',
      format: 'png',
      upsideDownRate: 0.03,
    });
    say(`generated ${g.pages} ${layout} ${fill} pages (seed ${seed}) in ${g.seconds.toFixed(1)} s`);
  }
}

if (args['generate-only']) process.exit(0);

// 2. extract, one batch per layout (each has its own schema)
const detector = await loadDetector(args.model!);
let extractSeconds = 0;
let pages = 0;
try {
  for (const layout of layouts) {
    const schema = await loadSchema(path.join('schemas', `${layout}.yaml`));
    const report = await runBatch({
      inputs: fills.map((f) => path.join(samplesDir, `${layout}-${f}`)),
      schemas: [schema],
      detector,
      outDir: path.join(resultsDir, layout),
      // Off by default: a result is reused when image, schema and model are unchanged, but a change in the code
      // that reads it would not be noticed.
      resume: args.resume,
      onDocument: (e) => {
        if (!e.reused) say(`[${layout} ${e.index + 1}/${e.total}] ${e.line.ok ? `${e.line.seconds?.toFixed(1)} s` : 'FAILED'}`);
      },
    });
    extractSeconds += report.summary.seconds;
    pages += report.summary.pages;
  }
} finally {
  await detector.close();
  await closeSharedOcrEngine();
}

// 3. score
const scored = await runScore({ results: resultsDir, truth: samplesDir, out: path.join(outDir, 'score.json') });
process.stdout.write(formatScore(scored.report, { perField: args['per-field'] }));

// 4. calibrate on even pages, measure on odd pages, per layout
const truthIndex = new Map<string, number>();
for (const layout of layouts) {
  for (const fill of fills) {
    const dir = path.join(samplesDir, `${layout}-${fill}`, 'truth');
    for (const f of await readdir(dir)) {
      if (!f.endsWith('.json')) continue;
      const t = JSON.parse(await readFile(path.join(dir, f), 'utf8')) as { index: number };
      truthIndex.set(path.parse(f).name, t.index);
    }
  }
}
const holdouts: Record<string, HoldoutEvaluation> = {};
for (const layout of layouts) {
  const schemaFile = path.join('schemas', `${layout}.yaml`);
  const { schema } = await loadSchema(schemaFile);
  const current = new Map(schema.fields.map((f) => [f.name, f.reviewThreshold ?? schema.defaults.reviewThreshold]));
  const items = scored.items.filter((i) => i.layout === layout);
  const even = items.filter((i) => (truthIndex.get(i.document) ?? 0) % 2 === 0);
  const odd = items.filter((i) => (truthIndex.get(i.document) ?? 0) % 2 === 1);
  const h = evaluateOnHoldout(calibrationSamples(even), calibrationSamples(odd), {
    targetError,
    minSamples: DEFAULT_MIN_SAMPLES,
    bins: DEFAULT_BINS,
    fallbackThreshold: (f) => current.get(f) ?? schema.defaults.reviewThreshold,
  });
  holdouts[layout] = h;
  const text = await readFile(schemaFile, 'utf8');
  const note = ` reviewThreshold values calibrated by npm run eval on the even pages of the evaluation set, target ${targetError}`;
  await writeFileAtomic(
    path.join(outDir, 'calibrated', `${layout}.yaml`),
    withReviewThresholds(text, schemaFile, new Map(h.proposal.fields.map((f) => [f.field, f.threshold])), note),
  );
}

// targets
const pct = (v: number | null | undefined, d = 2): string => (v === null || v === undefined ? '-' : `${(v * 100).toFixed(d)}%`);
const r = scored.report;
const held = Object.values(holdouts);
const sum = (pick: (h: HoldoutEvaluation) => number): number => held.reduce((a, h) => a + pick(h), 0);
const heldSamples = sum((h) => h.after.samples);
const heldAccepted = sum((h) => h.after.accepted);
const heldErrors = sum((h) => h.after.acceptedErrors);
const beforeAccepted = sum((h) => h.before.accepted);
const beforeErrors = sum((h) => h.before.acceptedErrors);
const typeIn = (fill: string, type: string): Metrics | undefined => r.byFillType[`${fill}/${type}`];
const rows: [string, string, string][] = [
  ['typed fields, exact match', '>= 97%', pct(r.byFill.typed?.exactMatch)],
  ['typed dates, exact match', '>= 98%', pct(typeIn('typed', 'date')?.exactMatch)],
  ['typed phones, exact match', '>= 98%', pct(typeIn('typed', 'phone')?.exactMatch)],
  ['typed checkboxes, exact', '>= 99.5%', pct(typeIn('typed', 'checkbox')?.exactMatch)],
  ['typed checkboxes + choice boxes, tick accuracy', '>= 99.5%', pct(r.byFill.typed?.markAccuracy)],
  ['ECE of stated confidence (all fields)', '<= 0.03', r.overall.ece?.toFixed(4) ?? '-'],
  [
    'held-out, schema thresholds: error among accepted / accepted',
    '',
    `${pct(beforeAccepted ? beforeErrors / beforeAccepted : null)} / ${pct(heldSamples ? beforeAccepted / heldSamples : null, 1)}`,
  ],
  [
    'held-out, calibrated thresholds: error among accepted / accepted',
    '<= 0.5% / >= 85%',
    `${pct(heldAccepted ? heldErrors / heldAccepted : null)} / ${pct(heldSamples ? heldAccepted / heldSamples : null, 1)}`,
  ],
  ...layouts.map(
    (l): [string, string, string] => [
      `held-out ECE ${l}: stated -> after isotonic map`,
      '',
      `${holdouts[l].eceRaw?.toFixed(4) ?? '-'} -> ${holdouts[l].eceCalibrated?.toFixed(4) ?? '-'}`,
    ],
  ),
  ['handwriting-style fields, exact match (reported, no target)', '', pct(r.byFill.handwriting?.exactMatch)],
  ['handwriting-style CER / tick accuracy', '', `${pct(r.byFill.handwriting?.cer)} / ${pct(r.byFill.handwriting?.markAccuracy)}`],
];
const w0 = Math.max(...rows.map((x) => x[0].length));
const w1 = Math.max(...rows.map((x) => x[1].length));
process.stdout.write(
  `\ntargets (evaluation seeds ${layouts.flatMap((l) => fills.map((f) => EVAL_SEEDS[l][f])).join(', ')}; ` +
    `${count} pages per layout and fill, degrade ${degrade})\n` +
    rows.map(([a, b, c]) => `${a.padEnd(w0)}  ${b.padEnd(w1)}  ${c}`).join('\n') +
    `\n\nextract: ${pages} pages, ${extractSeconds.toFixed(1)} s (${pages ? (extractSeconds / pages).toFixed(2) : '-'} s/page); ` +
    `wall ${((performance.now() - started) / 1000).toFixed(0)} s\n` +
    `wrote ${scored.out}, ${scored.diagram}, ${path.join(outDir, 'eval-report.json')}, ${path.join(outDir, 'calibrated')}/\n`,
);
await writeJsonAtomic(path.join(outDir, 'eval-report.json'), {
  seeds: EVAL_SEEDS,
  count,
  degrade,
  targetError,
  targets: Object.fromEntries(rows.map(([a, b, c]) => [a, { target: b, measured: c }])),
  holdout: Object.fromEntries(
    Object.entries(holdouts).map(([l, h]) => [
      l,
      {
        before: h.before,
        after: h.after,
        eceRaw: h.eceRaw,
        eceCalibrated: h.eceCalibrated,
        thresholds: Object.fromEntries(h.proposal.fields.map((f) => [f.field, { threshold: f.threshold, scope: f.scope }])),
      },
    ]),
  ),
});
