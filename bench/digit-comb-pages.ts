/**
 * Digit combs on generated form layouts with real handwriting: the demo layouts' digit combs (clinic-intake
 * tag_number, garden-plot member_no: six cells each) written with MNIST test-split digits (`samples generate
 * --real-digits`), the rest of the page in a handwriting-style font, light scans. Each page is extracted twice
 * with the same detector and schema, once with Tesseract alone and once with the digit reader beside it, and the
 * comb fields are scored against the truth: exact share, accepted share, wrong among accepted.
 *
 *   npx tsx bench/digit-comb-pages.ts [--set dev|eval] [--count 30] [--fill handwriting|typed] [--font-digits]
 *                                     [--out out/digit-pages] [--digit-model FILE] [--reuse]
 *
 * --digit-model: the digit model of the second arm (default the shipped one); --reuse: keep the pages already
 * generated in --out (they depend only on layout, seed and index), e.g. to compare two digit models on the same pages.
 *
 * --font-digits writes the comb digits in the page's font like the rest (with --fill typed: printed entries, where
 * Tesseract keeps its value unless the digit reader is measured better).
 *
 * Seeds: dev 800401/800402 (choices), eval 900401/900402 (reported figures). The schemas are the demo ones reduced
 * to their digit combs and scored with the schema defaults (review threshold 0.75, no confidence map): the demo
 * maps were fitted on Tesseract's reads of font handwriting, and a reduced form has no other fields for the
 * legibility factor, so both arms are judged alike by the uncalibrated score.
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { runBatch } from '../src/batch/run-batch.js';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { scoreAll } from '../src/eval/score.js';
import { loadScoreInputs } from '../src/eval/score-run.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { DEFAULT_DIGIT_MODEL_PATH, DigitReader } from '../src/read/digit-reader.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { loadSchema, resolveSchema, type LoadedSchema } from '../src/schema/load.js';
import { generateSamples } from '../src/synth/generate.js';

// The run's OCR engine, closed at the end.
const ocr = new OcrEngine();

const { values: args } = parseArgs({
  options: {
    set: { type: 'string', default: 'dev' },
    count: { type: 'string', default: '30' },
    fill: { type: 'string', default: 'handwriting' },
    out: { type: 'string', default: 'out/digit-pages' },
    'font-digits': { type: 'boolean', default: false },
    'digit-model': { type: 'string', default: DEFAULT_DIGIT_MODEL_PATH },
    reuse: { type: 'boolean', default: false },
  },
});
const COMBS = { 'clinic-intake': 'tag_number', 'garden-plot': 'member_no' } as const;
const SEEDS = { dev: { 'clinic-intake': 800401, 'garden-plot': 800402 }, eval: { 'clinic-intake': 900401, 'garden-plot': 900402 } } as const;
const set = args.set === 'eval' ? 'eval' : 'dev';
const fill = args.fill === 'typed' ? 'typed' : 'handwriting';
const count = Number(args.count);
const realDigits = !args['font-digits'];
const out = path.resolve(args.out!, `${set}-${fill}${realDigits ? '' : '-font'}`);
const say = (s: string) => void process.stderr.write(`${s}\n`);

const detector = await loadDetector(DEFAULT_MODEL_PATH);
const reader = await DigitReader.open(args['digit-model']);
const rows: string[] = [];
try {
  for (const arm of ['ocr', 'digits'] as const) {
    let exact = 0, accepted = 0, wrongAccepted = 0, total = 0, disagree = 0;
    for (const [layout, fieldName] of Object.entries(COMBS) as [keyof typeof COMBS, string][]) {
      const samples = path.join(out, 'samples', layout);
      if (arm === 'ocr' && !(args.reuse && existsSync(path.join(samples, 'truth')))) {
        const g = await generateSamples({
          layout, count, seed: SEEDS[set][layout], out: samples, fill, degrade: 'light', styles: 'heldout', format: 'png', upsideDownRate: 0, realDigits,
        });
        say(`generated ${g.pages} ${layout} pages in ${g.seconds.toFixed(0)} s`);
      }
      const full = await loadSchema(path.join('schemas', `${layout}.yaml`));
      const reduced: LoadedSchema = resolveSchema({
        ...full,
        schema: {
          ...full.schema,
          fields: full.schema.fields
            .filter((f) => f.name === fieldName)
            .map((f) => ({ ...f, confidenceMap: undefined, reviewThreshold: undefined })),
        },
      });
      const results = path.join(out, `results-${arm}`, layout);
      await runBatch({ ocr, inputs: [samples], schemas: [reduced], detector, outDir: results, digitReader: arm === 'digits' ? reader : undefined });
      const { items } = scoreAll({ ...(await loadScoreInputs(results, samples)), bins: 10 });
      const { results: docs } = await loadScoreInputs(results, samples);
      for (const doc of docs.values()) for (const f of doc.fields) if (f.reasons.includes('ambiguous_digit_readers')) disagree++;
      for (const i of items.filter((x) => x.field === fieldName)) {
        total++;
        if (i.correct) exact++;
        if (i.accepted) {
          accepted++;
          if (!i.correct) wrongAccepted++;
        }
      }
    }
    const pct = (a: number, b: number) => (b ? ((100 * a) / b).toFixed(1) : '-');
    rows.push(
      `${arm === 'ocr' ? 'tesseract alone   ' : 'tesseract + digits'}: ${total} comb fields, exact ${pct(exact, total)} %, accepted ${pct(accepted, total)} %, ` +
        `wrong among accepted ${pct(wrongAccepted, accepted)} % (${wrongAccepted}/${accepted})${arm === 'digits' ? `, disagreements ${disagree}` : ''}`,
    );
  }
} finally {
  await detector.close();
  await reader.close();
  await ocr.close();
}
process.stdout.write(
  `digit-comb-pages: digit model ${args['digit-model']}, set ${set}, fill ${fill}, comb digits ${realDigits ? 'MNIST test split' : 'in the page font'}, ${count} pages per layout (demo layouts, light scans)\n${rows.join('\n')}\n`,
);
