/**
 * `npm run eval`: the fixed labeled sets, end to end. Two sets of the same make, with different seeds:
 *  - the development set (`--set dev`, seeds 800101-800302, out/dev): scoring constants are chosen on it, the demo
 *    schemas' confidence maps and thresholds are fitted on it (`--write-schemas`), and per-fill thresholds for the
 *    evaluation set are fitted on it;
 *  - the evaluation set (`--set eval`, the default; seeds 900101-900302, reserved: never used for training, choices
 *    or fitting, out/eval): the figures reported against the targets.
 * Training uses seeds 1..99999. `npm run eval` runs the development set, then the evaluation set.
 *
 *  1. generate, for each demo layout, typed and handwriting-style fills with light scan degradation, into
 *     <out>/samples/<layout>-<fill>/ (skipped when already there: pages depend only on seed and index);
 *  2. extract each layout with its demo schema into <out>/results/<layout>/ (--resume keeps earlier results);
 *  3. score everything: the table, <out>/score.json and the reliability diagram;
 *  4. fit confidence maps and review thresholds per layout and fill (typed and handwriting apart), on the development
 *     set (for --set eval) or on the even pages (for --set dev), measure them on the evaluation set (or the odd
 *     pages), write the calibrated schemas to <out>/calibrated/, and print the measured figures next to the targets.
 *
 * Options: --count N pages per layout and fill (default 20), --generate-only (prepare the set, stop),
 * --resume (reuse results of unchanged pages: only when the code has not changed since), --layouts a,b,
 * --fills typed,handwriting, --degrade none|light|heavy, --model FILE, --target-error 0.005, --out DIR, --per-field,
 * --set eval|dev, --fit-from DIR (default out/dev), --write-schemas (dev set only: fit each demo schema's confidence
 * maps and review thresholds on all development pages of its layout, typed and handwriting together, and write
 * them into schemas/<layout>.yaml; the fit uses raw confidences, so the schemas the pages were read with may
 * already carry maps).
 */
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { runBatch } from '../src/batch/run-batch.js';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { writeFileAtomic, writeJsonAtomic } from '../src/io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { loadSchema } from '../src/schema/load.js';
import { generateSamples } from '../src/synth/generate.js';
import type { FillMode } from '../src/synth/fill.js';
import type { LayoutName } from '../src/synth/layouts.js';
import type { DegradeLevel } from '../src/synth/scan-params.js';
import { calibrateItems, calibrationSamples, DEFAULT_MIN_SAMPLES, schemaCalibration } from '../src/eval/calibration-run.js';
import { DEMO_CALIBRATION_FILE, type DemoCalibration } from '../src/synth/demo-calibration.js';
import { evaluateOnHoldout, type HoldoutEvaluation } from '../src/eval/calibration-holdout.js';
import { withCalibration } from '../src/schema/calibration-yaml.js';
import { DEFAULT_BINS } from '../src/eval/reliability.js';
import { runScore } from '../src/eval/score-run.js';
import { formatScore } from '../src/eval/score-table.js';
import { scoreAll, type Metrics, type ScoredField } from '../src/eval/score.js';
import { loadScoreInputs } from '../src/eval/score-run.js';

// The run's OCR engine, closed at the end.
const ocr = new OcrEngine();

const LAYOUTS = ['clinic-intake', 'marina-slip', 'garden-plot'] as const;
const FILLS = ['typed', 'handwriting'] as const;

type SeedTable = Record<(typeof LAYOUTS)[number], Record<(typeof FILLS)[number], number>>;
/** Run seeds of the evaluation set, one per layout and fill; all >= 900000, the range reserved for evaluation. */
const EVAL_SEEDS: SeedTable = {
  'clinic-intake': { typed: 900101, handwriting: 900102 },
  'marina-slip': { typed: 900201, handwriting: 900202 },
  'garden-plot': { typed: 900301, handwriting: 900302 },
};
/** The development set: seeds 800000..899999, used neither for training (1..99999) nor for evaluation. Choices of
 *  scoring constants are made on it, and the demo schemas' confidence maps and thresholds are fitted on it. */
const DEV_SEEDS: SeedTable = {
  'clinic-intake': { typed: 800101, handwriting: 800102 },
  'marina-slip': { typed: 800201, handwriting: 800202 },
  'garden-plot': { typed: 800301, handwriting: 800302 },
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
    out: { type: 'string' },
    'per-field': { type: 'boolean', default: false },
    set: { type: 'string', default: 'eval' },
    'write-schemas': { type: 'boolean', default: false },
    'fit-from': { type: 'string' },
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
const set = listOf('set', args.set!, ['eval', 'dev'] as const)[0];
const SEEDS = set === 'dev' ? DEV_SEEDS : EVAL_SEEDS;
if (args['write-schemas'] && set !== 'dev') throw new Error('--write-schemas: only with --set dev (the evaluation set must stay unseen)');
const outDir = path.resolve(args.out ?? (set === 'dev' ? 'out/dev' : 'out/eval'));
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
    const seed = SEEDS[layout][fill];
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
    const report = await runBatch({ ocr,
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
  await ocr.close();
}

// 3. score
const scored = await runScore({ results: resultsDir, truth: samplesDir, out: path.join(outDir, 'score.json') });
process.stdout.write(formatScore(scored.report, { perField: args['per-field'] }));

// 4. calibration figures. The evaluation set is measured with thresholds fitted on the development set's pages of
// the same layout and fill (--fit-from, default out/dev: run `npm run eval -- --set dev` first); the development
// set itself is fitted on its even pages and measured on its odd ones.
let fitItems: ScoredField[] | null = null;
/** Page index of each document, for the even/odd split of the development set. */
const truthIndex = new Map<string, number>();
if (set === 'eval') {
  const fitDir = path.resolve(args['fit-from'] ?? 'out/dev');
  const inputs = await loadScoreInputs(path.join(fitDir, 'results'), path.join(fitDir, 'samples')).catch((e: Error) => {
    throw new Error(`${e.message} (the evaluation set's thresholds are fitted on the development set: run npm run eval -- --set dev first)`);
  });
  fitItems = scoreAll({ ...inputs, bins: DEFAULT_BINS }).items;
} else {
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
}
const isEven = (i: ScoredField): boolean => (truthIndex.get(i.document) ?? 0) % 2 === 0;
// Typed and handwriting-style fills are calibrated apart, as an office calibrates on its own forms: a person's
// hand and a printer's type give confidences of different worth.
const holdouts: Record<string, HoldoutEvaluation> = {};
for (const layout of layouts) {
  const schemaFile = path.join('schemas', `${layout}.yaml`);
  const text = await readFile(schemaFile, 'utf8');
  for (const fill of fills) {
    const items = scored.items.filter((i) => i.layout === layout && i.fill === fill);
    const fit = fitItems ? fitItems.filter((i) => i.layout === layout && i.fill === fill) : items.filter(isEven);
    const held = fitItems ? items : items.filter((i) => !isEven(i));
    if (fit.length === 0) throw new Error(`no ${layout} ${fill} fields to fit thresholds on`);
    // The schema's own thresholds are on its maps' scale, not comparable with raw confidences: a field the fit
    // never saw goes to review.
    const h = evaluateOnHoldout(calibrationSamples(fit), calibrationSamples(held), {
      targetError,
      minSamples: DEFAULT_MIN_SAMPLES,
      bins: DEFAULT_BINS,
      fallbackThreshold: () => 1,
    });
    holdouts[`${layout}/${fill}`] = h;
    const note = ` reviewThreshold values calibrated by npm run eval on the ${fitItems ? '' : 'even '}${fill} pages of the development set, target ${targetError}`;
    const fields = new Map(h.proposal.fields.map((f) => [f.field, schemaCalibration(f)]));
    await writeFileAtomic(path.join(outDir, 'calibrated', `${layout}-${fill}.yaml`), withCalibration(text, schemaFile, fields, note));
  }
}

// Per-field maps for the demo schemas (an option; the shipped demo schemas carry none and are stated with the shipped
// maps per type and script, src/fields/default-confidence.json): maps and thresholds fitted on every development page
// of the layout, typed and handwriting together, kept in src/synth/demo/calibration.json so that npm run samples:make
// writes the same schemas.
if (args['write-schemas']) {
  const calibration: Record<string, DemoCalibration> = {};
  for (const layout of layouts) {
    const { schema } = await loadSchema(path.join('schemas', `${layout}.yaml`));
    const fit = calibrateItems(scored.items.filter((i) => i.layout === layout), schema, { targetError, minSamples: DEFAULT_MIN_SAMPLES });
    calibration[layout] = {
      note:
        `confidenceMap and reviewThreshold fitted on ${fit.documents} development-set documents (seeds ` +
        `${fills.map((f) => SEEDS[layout][f]).join(', ')}; ${fills.join(' and ')} fills; target error among accepted ` +
        `fields ${targetError}) by npx tsx bench/eval-set.ts --set dev --write-schemas`,
      fields: Object.fromEntries(fit.fields),
    };
  }
  // One map point per line is unreadable: keep each [x, y] pair on one line.
  const json = JSON.stringify(calibration, null, 1).replace(/\[\s+([\d.e-]+),\s+([\d.e-]+)\s+\]/g, '[$1, $2]');
  await writeFileAtomic(DEMO_CALIBRATION_FILE, `${json}\n`);
  say(`wrote ${DEMO_CALIBRATION_FILE}; regenerate the schemas with npm run samples:make`);
}

/** ECE of the held-out halves after their own fit halves' maps, pooled by sample count. */
function pooledEce(hs: HoldoutEvaluation[]): string {
  const n = sum(hs, (h) => h.after.samples);
  return n ? (sum(hs, (h) => (h.eceCalibrated ?? 0) * h.after.samples) / n).toFixed(4) : '-';
}

// targets
const pct = (v: number | null | undefined, d = 2): string => (v === null || v === undefined ? '-' : `${(v * 100).toFixed(d)}%`);
const r = scored.report;
const held = (fill?: string): HoldoutEvaluation[] =>
  Object.entries(holdouts).filter(([k]) => !fill || k.endsWith(`/${fill}`)).map(([, h]) => h);
const sum = (hs: HoldoutEvaluation[], pick: (h: HoldoutEvaluation) => number): number => hs.reduce((a, h) => a + pick(h), 0);
/** Error among accepted / accepted share of the fitted thresholds on the held-out pages. */
const outcome = (hs: HoldoutEvaluation[]): string => {
  const n = sum(hs, (h) => h.after.samples);
  const acc = sum(hs, (h) => h.after.accepted);
  const err = sum(hs, (h) => h.after.acceptedErrors);
  return `${pct(acc ? err / acc : null)} / ${pct(n ? acc / n : null, 1)}`;
};
/** What the schemas in schemas/ did: statuses as extract gave them (their own maps and thresholds). */
const shipped = (fill: string): string => {
  const its = scored.items.filter((i) => i.fill === fill);
  const acc = its.filter((i) => i.accepted);
  const err = acc.filter((i) => !i.correct).length;
  return `${pct(acc.length ? err / acc.length : null)} / ${pct(its.length ? acc.length / its.length : null, 1)}`;
};
const fitName = fitItems ? 'development-set' : 'even';
const typeIn = (fill: string, type: string): Metrics | undefined => r.byFillType[`${fill}/${type}`];
const rows: [string, string, string][] = [
  ['typed fields, exact match', '>= 97%', pct(r.byFill.typed?.exactMatch)],
  ['typed dates, exact match', '>= 98%', pct(typeIn('typed', 'date')?.exactMatch)],
  ['typed phones, exact match', '>= 98%', pct(typeIn('typed', 'phone')?.exactMatch)],
  ['typed checkboxes, exact', '>= 99.5%', pct(typeIn('typed', 'checkbox')?.exactMatch)],
  ['typed checkboxes + choice boxes, tick accuracy', '>= 99.5%', pct(r.byFill.typed?.markAccuracy)],
  ['ECE of stated confidence (all fields)', '<= 0.03', r.overall.ece?.toFixed(4) ?? '-'],
  ...fills.map((f): [string, string, string] => [`ECE of stated confidence (${f})`, '', r.byFill[f]?.ece?.toFixed(4) ?? '-']),
  ['demo schemas as shipped: error among accepted / accepted (typed)', '', shipped('typed')],
  [`thresholds fitted on ${fitName} typed pages: error among accepted / accepted`, '<= 0.5% / >= 85%', outcome(held('typed'))],
  [`ECE after maps fitted on ${fitName} typed pages`, '', pooledEce(held('typed'))],
  ...(fills.includes('handwriting')
    ? ([
        ['demo schemas as shipped (handwriting)', '', shipped('handwriting')],
        [`thresholds fitted on ${fitName} handwriting pages`, '', outcome(held('handwriting'))],
        [`ECE after maps fitted on ${fitName} handwriting pages`, '', pooledEce(held('handwriting'))],
        ['handwriting-style fields, exact match (reported, no target)', '', pct(r.byFill.handwriting?.exactMatch)],
        ['handwriting-style CER / tick accuracy', '', `${pct(r.byFill.handwriting?.cer)} / ${pct(r.byFill.handwriting?.markAccuracy)}`],
      ] as [string, string, string][])
    : []),
];
const w0 = Math.max(...rows.map((x) => x[0].length));
const w1 = Math.max(...rows.map((x) => x[1].length));
process.stdout.write(
  `\ntargets (${set} set, seeds ${layouts.flatMap((l) => fills.map((f) => SEEDS[l][f])).join(', ')}; ` +
    `${count} pages per layout and fill, degrade ${degrade})\n` +
    rows.map(([a, b, c]) => `${a.padEnd(w0)}  ${b.padEnd(w1)}  ${c}`).join('\n') +
    `\n\nextract: ${pages} pages, ${extractSeconds.toFixed(1)} s (${pages ? (extractSeconds / pages).toFixed(2) : '-'} s/page); ` +
    `wall ${((performance.now() - started) / 1000).toFixed(0)} s\n` +
    `wrote ${scored.out}, ${scored.diagram}, ${path.join(outDir, 'eval-report.json')}, ${path.join(outDir, 'calibrated')}/\n`,
);
await writeJsonAtomic(path.join(outDir, 'eval-report.json'), {
  set,
  seeds: SEEDS,
  count,
  degrade,
  targetError,
  targets: Object.fromEntries(rows.map(([a, b, c]) => [a, { target: b, measured: c }])),
  holdout: Object.fromEntries(
    Object.entries(holdouts).map(([l, h]) => [
      l,
      {
        after: h.after,
        eceRaw: h.eceRaw,
        eceCalibrated: h.eceCalibrated,
        thresholds: Object.fromEntries(h.proposal.fields.map((f) => [f.field, { threshold: f.threshold, scope: f.scope }])),
      },
    ]),
  ),
});
