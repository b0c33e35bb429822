/**
 * Digit combs on real layouts with real handwriting: `npx tsx bench/real-form-combs.ts`.
 *
 * For every fillable PDF in the forms folder (default ../shared/reference/real-forms/pdfs, relative to the repo root)
 * that has comb widgets (`schema from-pdf` types them class comb_field):
 *  1. `samples fill --fill handwriting --real-digits` (src/synth/pdf-fill/): N pages written in the handwriting fonts,
 *     the digits of comb boxes (and of digit-only fields) real handwritten digits from the MNIST test split
 *     (src/synth/mnist-digits.ts; never trained on), light scan degradation; page i depends only on seed and i;
 *  2. the digit combs of the form: comb fields the filler wrote digits alone into (SSN, EIN, ITIN, account,
 *     routing, file and ZIP boxes; and, where a field's name says nothing of its content, the pages on which the
 *     filler chose digits for it); combs of names and words are left out;
 *  3. `extract` through the real batch runner with the shipped detector and the drafted schema reduced to those
 *     combs, a text comb given the pattern ^[0-9]+$ (what a person checking the drafted schema writes for a box of
 *     digits; without a digits-only pattern or type a comb is not read digit by digit), schema defaults (review
 *     threshold 0.75, no confidence map: the drafted schema has none); twice, over the same pages in the same run:
 *     with Tesseract alone and with the digit reader beside it (--digit-model, default the shipped one);
 *  4. `score` against the truth the filler wrote, over the digit combs that hold digits on the page.
 * Then per form and per half (bench/real-forms-split.json: development for choices, held-out for reported
 * figures): comb fields written, exact (normalized value = truth), accepted (without review), wrong among accepted,
 * and how often the digit reader's cells were cut (cells found). No field values are printed.
 *
 * Options: --forms DIR, --count N (pages per form, default 8), --seed S (default 920000), --half dev|held-out|all,
 * --only a,b (file stems), --digit-model FILE, --out DIR (default bench/out/real-form-combs), --reuse (keep filled
 * pages already there), --arms ocr,digits (which of the two to run: e.g. --reuse --arms digits to compare another
 * digit model on the same pages), --json FILE (the figures as JSON).
 */
import { existsSync } from 'node:fs';
import { readdir, readFile, rm } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { runBatch } from '../src/batch/run-batch.js';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { draftFromPdf } from '../src/draft/from-pdf/from-pdf.js';
import { oneLine } from '../src/errors.js';
import { formatTable } from '../src/io/text-table.js';
import { scoreAll } from '../src/eval/score.js';
import { loadScoreInputs } from '../src/eval/score-run.js';
import { writeJsonAtomic } from '../src/io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { DEFAULT_DIGIT_MODEL_PATH, DigitReader } from '../src/read/digit-reader.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { loadSchema, resolveSchema, type LoadedSchema } from '../src/schema/load.js';
import { fillPdfSamples } from '../src/synth/pdf-fill/fill-pdf.js';
import type { PageTruth } from '../src/synth/truth.js';
import { isWrittenDigitComb } from './digit-comb-truth.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

const { values: args } = parseArgs({
  options: {
    forms: { type: 'string', default: path.join(ROOT, '..', 'shared', 'reference', 'real-forms', 'pdfs') },
    count: { type: 'string', default: '8' },
    seed: { type: 'string', default: '920000' },
    half: { type: 'string', default: 'all' },
    only: { type: 'string' },
    'digit-model': { type: 'string', default: DEFAULT_DIGIT_MODEL_PATH },
    out: { type: 'string', default: path.join(ROOT, 'bench', 'out', 'real-form-combs') },
    reuse: { type: 'boolean', default: false },
    json: { type: 'string' },
    arms: { type: 'string', default: 'ocr,digits' },
  },
});
const count = Number(args.count);
if (!Number.isInteger(count) || count < 1) throw new Error(`--count: expected a whole number >= 1, got "${args.count}"`);
const seed = Number(args.seed);
if (!['dev', 'held-out', 'all'].includes(args.half!)) throw new Error(`--half: dev, held-out or all; got "${args.half}"`);

const split = JSON.parse(await readFile(path.join(ROOT, 'bench', 'real-forms-split.json'), 'utf8')) as { development: string[]; heldOut: string[] };
const halfOf = (file: string) => (split.development.includes(file) ? 'dev' : split.heldOut.includes(file) ? 'held-out' : 'unsplit');
let files = (await readdir(args.forms!)).filter((f) => f.toLowerCase().endsWith('.pdf')).sort();
if (args.half !== 'all') files = files.filter((f) => halfOf(f) === args.half);
if (args.only) {
  const only = new Set(args.only.split(',').map((s) => s.trim().replace(/\.pdf$/i, '')));
  files = files.filter((f) => only.has(f.replace(/\.pdf$/i, '')));
}
const say = (s: string): void => void process.stderr.write(`${s}\n`);

/** A digit pattern for text combs: digits only, any count (the cell count bounds it through maxLength). */
const DIGITS = '^[0-9]+$';

/** Comb fields the filler wrote digits alone into on at least one page (on forms whose field names say nothing of
 *  their content, the filler writes digits on some pages and words on others; only the digit pages are scored). */
function digitCombs(truths: readonly PageTruth[]): Set<string> {
  const names = new Set<string>();
  for (const t of truths) for (const f of t.fields) if (isWrittenDigitComb(f)) names.add(f.name);
  return names;
}

function reduce(full: LoadedSchema, names: Set<string>): LoadedSchema {
  return resolveSchema({
    ...full,
    schema: {
      ...full.schema,
      fields: full.schema.fields
        .filter((f) => names.has(f.name))
        .map((f) => ({
          ...f,
          options: f.type === 'text' ? { ...(f.options ?? {}), pattern: (f.options as { pattern?: string } | undefined)?.pattern ?? DIGITS } : f.options,
          confidenceMap: undefined,
          reviewThreshold: undefined,
        })),
    },
  });
}

interface Tally {
  fields: number;
  exact: number;
  accepted: number;
  wrongAccepted: number;
  /** Fields the digit reader read cell by cell (its cells were found). */
  cut: number;
}
const zero = (): Tally => ({ fields: 0, exact: 0, accepted: 0, wrongAccepted: 0, cut: 0 });
const ARMS = (['ocr', 'digits'] as const).filter((a) => args.arms!.split(',').includes(a));
if (ARMS.length === 0) throw new Error(`--arms: ocr, digits or both; got "${args.arms}"`);
interface Row {
  form: string;
  half: string;
  combs: number;
  note: string | null;
  arms: Record<'ocr' | 'digits', Tally>;
}

const rows: Row[] = [];
const detector = await loadDetector(DEFAULT_MODEL_PATH);
const reader = await DigitReader.open(args['digit-model']);
const ocr = new OcrEngine();
try {
  for (const file of files) {
    const form = file.replace(/\.pdf$/i, '');
    const row: Row = { form, half: halfOf(file), combs: 0, note: null, arms: { ocr: zero(), digits: zero() } };
    try {
      const draft = await draftFromPdf(path.join(args.forms!, file), { page: 0, image: `${form}.blank.png` });
      if (!draft.sources.some((s) => s.kind === 'comb')) continue;
      rows.push(row);
      const samples = path.join(args.out!, 'samples', form);
      const have = existsSync(path.join(samples, 'truth')) ? (await readdir(path.join(samples, 'truth'))).length : 0;
      if (!args.reuse || have !== count) {
        await rm(samples, { recursive: true, force: true });
        await fillPdfSamples({ form: path.join(args.forms!, file), page: 0, count, seed, out: samples, degrade: 'light', upsideDownRate: 0, fill: 'handwriting', realDigits: true });
      }
      const truthDir = path.join(samples, 'truth');
      const truths = await Promise.all((await readdir(truthDir)).map(async (f) => JSON.parse(await readFile(path.join(truthDir, f), 'utf8')) as PageTruth));
      const combs = digitCombs(truths);
      row.combs = combs.size;
      if (combs.size === 0) {
        row.note = 'no comb holds digits alone';
        continue;
      }
      const schema = reduce(await loadSchema(path.join(samples, `${form}.yaml`)), combs);
      const pages = (await readdir(samples)).filter((f) => f.endsWith('.png') && !f.endsWith('.blank.png')).map((f) => path.join(samples, f));
      for (const arm of ARMS) {
        const results = path.join(args.out!, `results-${arm}`, form);
        await rm(results, { recursive: true, force: true });
        await runBatch({ ocr, inputs: pages, schemas: [schema], detector, outDir: results, digitReader: arm === 'digits' ? reader : undefined });
        const inputs = await loadScoreInputs(results, samples);
        const written = new Set<string>();
        for (const [doc, t] of inputs.truth) for (const f of t.fields) if (combs.has(f.name) && isWrittenDigitComb(f)) written.add(`${doc}\u0000${f.name}`);
        const tally = row.arms[arm];
        for (const i of scoreAll({ ...inputs, bins: 10 }).items) {
          if (!written.has(`${i.document}\u0000${i.field}`)) continue;
          tally.fields++;
          if (i.correct) tally.exact++;
          if (i.accepted) {
            tally.accepted++;
            if (!i.correct) tally.wrongAccepted++;
          }
        }
        for (const [doc, r] of inputs.results) {
          for (const f of r.fields) if (written.has(`${doc}\u0000${f.name}`) && (f.details as { digitCells?: unknown } | undefined)?.digitCells) tally.cut++;
        }
      }
      say(`${form}: ${combs.size} digit combs; exact ${ARMS.map((a) => `${a} ${row.arms[a].exact}/${row.arms[a].fields}`).join(', ')}`);
    } catch (err) {
      row.note = oneLine(err);
      say(`${form}: failed: ${row.note}`);
    }
  }
} finally {
  await detector.close();
  await reader.close();
  await ocr.close();
}

const pct = (a: number, b: number) => (b > 0 ? `${((100 * a) / b).toFixed(1)} %` : '-');
const sum = (rs: readonly Row[], arm: 'ocr' | 'digits'): Tally =>
  rs.reduce((t, r) => ({ fields: t.fields + r.arms[arm].fields, exact: t.exact + r.arms[arm].exact, accepted: t.accepted + r.arms[arm].accepted, wrongAccepted: t.wrongAccepted + r.arms[arm].wrongAccepted, cut: t.cut + r.arms[arm].cut }), zero());
const cells = (t: Tally, arm: string) => [String(t.fields), pct(t.exact, t.fields), pct(t.accepted, t.fields), `${pct(t.wrongAccepted, t.accepted)} (${t.wrongAccepted}/${t.accepted})`, arm === 'digits' ? pct(t.cut, t.fields) : ''];
const HEADER = ['form', 'combs', 'reader', 'fields', 'exact', 'accepted', 'wrong|acc', 'cells cut'];
const out: string[] = [];
for (const half of ['dev', 'held-out', 'unsplit'] as const) {
  const rs = rows.filter((r) => r.half === half);
  if (rs.length === 0) continue;
  const body: string[][] = [];
  for (const r of rs) {
    if (r.note !== null) body.push([r.form, String(r.combs), r.note.slice(0, 70), '', '', '', '', '']);
    else for (const arm of ARMS) body.push([arm === ARMS[0] ? r.form : '', arm === ARMS[0] ? String(r.combs) : '', arm === 'ocr' ? 'tesseract' : '+ digit reader', ...cells(r.arms[arm], arm)]);
  }
  for (const arm of ARMS) body.push([arm === ARMS[0] ? 'pooled' : '', '', arm === 'ocr' ? 'tesseract' : '+ digit reader', ...cells(sum(rs, arm), arm)]);
  out.push(half === 'dev' ? 'development half' : half === 'held-out' ? 'held-out half' : 'forms outside the split', formatTable(HEADER, body, { rule: true }), '');
}
out.push(
  `${count} handwriting pages per form, seed ${seed}, light scans; comb digits: MNIST test split; digit model ${path.relative(ROOT, args['digit-model']!)}.`,
  'fields: digit combs holding digits on the page (pages x combs); exact: normalized value = truth; accepted: without review; ' +
    'wrong|acc: wrong among accepted; cells cut: fields the digit reader read cell by cell (else Tesseract alone).',
);
process.stdout.write(`${out.join('\n')}\n`);
if (args.json) {
  await writeJsonAtomic(args.json, { count, seed, digitModel: path.relative(ROOT, args['digit-model']!), forms: rows, pooled: Object.fromEntries(['dev', 'held-out'].map((h) => [h, Object.fromEntries(ARMS.map((a) => [a, sum(rows.filter((r) => r.half === h && r.note === null), a)]))])) });
}
