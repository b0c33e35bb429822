/**
 * The digit reader against Tesseract on real handwriting: every MNIST test-split digit (src/synth/mnist-digits.ts:
 * the last 15 % of each class, never trained on), written into rendered comb boxes.
 *
 *   npx tsx bench/digit-combs.ts [--strips N] [--seed S] [--degrade none|light|heavy] [--half all|even|odd]
 *                                [--json out/digit-combs.json] [--fit-from dev.json] [--model FILE] [--reader-only]
 *
 * --model: the digit model to measure (default the shipped one); --reader-only: part 1 for the digit reader alone
 * (per-digit accuracy and speed, no Tesseract and no fields), a quick comparison of training runs.
 *
 * 1. Cells: the test digits, shuffled with the seed, six to a comb strip (cells 34..48 x 44..58 px, as comb boxes
 *    at 200 DPI; box stroke 1..3 px), scan noise of the chosen level. Each cell is cut at the printed separators
 *    (read/read-text.ts locateCombCells) and read (a) by the digit reader, all cells of a strip in one batch, and
 *    (b) by Tesseract one character per cell (PSM 10, digits only, the comb_cells cleanup). Per-digit accuracy of
 *    both, and the digit reader's milliseconds per cell on one core (onnxruntime intraOpNumThreads 1).
 * 2. Fields: each strip is a six-digit comb field (text, pattern ^[0-9]{6}$) read as `extract` reads it
 *    (pipeline/read-field.ts, schema defaults: padding 4, review threshold 0.75, no confidence map, detection score
 *    0.9), once with Tesseract alone and once with the digit reader beside it: exact share, accepted share and
 *    wrong among accepted; with --fit-from, also at the threshold that kept the development run's accepted fields at
 *    most 1 % wrong (fit on --half even, measure on --half odd).
 */
import { readFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { getFieldType } from '../src/fields/registry.js';
import { writeJsonAtomic } from '../src/io/atomic-write.js';
import type { LocatedField } from '../src/locate/locate-fields.js';
import { IDENTITY } from '../src/image/geometry.js';
import { cropGray } from '../src/image/raster.js';
import { buildFieldResult } from '../src/pipeline/field-result.js';
import { readLocatedField } from '../src/pipeline/read-field.js';
import { cellImage } from '../src/read/comb-cells.js';
import { cropField } from '../src/read/crop.js';
import { DEFAULT_DIGIT_MODEL_PATH, DigitReader } from '../src/read/digit-reader.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { locateCombCells } from '../src/read/read-text.js';
import { removeDashedRules } from '../src/read/cleanup/line-removal.js';
import { COMB_CELLS } from '../src/read/variants.js';
import { FieldSpec } from '../src/schema/definition.js';
import { digitCombStrip } from '../src/synth/digit-comb-strip.js';
import { testIndices } from '../src/synth/mnist-digits.js';
import { Rng } from '../src/synth/prng.js';
import type { DegradeLevel } from '../src/synth/scan-params.js';

const { values: args } = parseArgs({
  options: {
    strips: { type: 'string' },
    seed: { type: 'string', default: '910001' },
    degrade: { type: 'string', default: 'light' },
    json: { type: 'string' },
    'fit-from': { type: 'string' },
    half: { type: 'string', default: 'all' },
    model: { type: 'string', default: DEFAULT_DIGIT_MODEL_PATH },
    'reader-only': { type: 'boolean', default: false },
  },
});
const readerOnly = args['reader-only']!;
const seed = Number(args.seed);

/** Lowest confidence threshold with at most `maxError` wrong among the decidable fields at or above it (1.01: none). */
function fitThreshold(items: { confidence: number; decidable: boolean; right: boolean }[], maxError: number): number {
  const sorted = items.filter((x) => x.decidable).sort((a, b) => a.confidence - b.confidence);
  for (let i = 0; i < sorted.length; i++) {
    const above = sorted.slice(i);
    if (above.filter((x) => !x.right).length <= maxError * above.length) return sorted[i].confidence;
  }
  return 1.01;
}
const degrade = args.degrade as DegradeLevel;
const CELLS = 6;

const all: { digit: number; index: number }[] = [];
// --half even|odd: only test digits with an even (odd) index, so that a threshold fitted on one half is measured on
// the other (development half for choices, the other half for reported figures).
const parity = args.half === 'even' ? 0 : args.half === 'odd' ? 1 : null;
for (let d = 0; d <= 9; d++) for (const index of testIndices(d)) if (parity === null || index % 2 === parity) all.push({ digit: d, index });
const order = new Rng(seed).shuffle(all);
const stripCount = Math.min(Math.floor(order.length / CELLS), args.strips ? Number(args.strips) : Infinity);

const reader = await DigitReader.open(args.model);
const engine = new OcrEngine();
const spec = FieldSpec.parse({ name: 'number', type: 'text', class: 'comb_field', page: 0, region: [0, 0, 1, 1], options: { pattern: '^[0-9]{6}$' } });
const type = getFieldType('text');
const options = type.options.parse(spec.options ?? {});

const perDigit = Array.from({ length: 10 }, () => ({ n: 0, reader: 0, tesseract: 0 }));
let cutFailures = 0;
/** Per arm, each field's confidence, whether a threshold decides it (valid, no ambiguity reason) and whether it is right. */
const decided: Record<'ocr' | 'both', { confidence: number; decidable: boolean; right: boolean }[]> = { ocr: [], both: [] };
/** Tesseract alone: each field's OCR factor and whether its value was right (for DOUBTFUL_OCR). */
const ocrConfidences: { ocr: number; right: boolean; valid: boolean }[] = [];
/** Each cell's top probability and whether the reader was right: for placing confidence thresholds (--json). */
const cellConfidences: { confidence: number; right: boolean }[] = [];
/** Each field's weakest digit probability (digit arm) and whether the value was right. */
const fieldConfidences: { weakest: number; ocr: number; right: boolean; kept: string; agree: boolean; status: string }[] = [];
let readerMs = 0;
let readerCells = 0;
const fields = { ocr: { exact: 0, accepted: 0, wrongAccepted: 0 }, both: { exact: 0, accepted: 0, wrongAccepted: 0, disagree: 0 } };
const started = performance.now();

for (let s = 0; s < stripCount; s++) {
  const digits = order.slice(s * CELLS, (s + 1) * CELLS);
  const strip = await digitCombStrip(digits, new Rng(seed).fork(`strip${s}`), degrade);
  const truth = digits.map((d) => d.digit).join('');

  // 1. cells
  const crop = cropField(strip.image, strip.box, 4);
  const { cells, ruled } = locateCombCells(crop, COMB_CELLS, 0);
  const cellsOk = cells.length === CELLS;
  if (!cellsOk) cutFailures++;
  const grays = cellsOk ? cells.map((c) => cropGray(crop.image, c)) : [];
  const t0 = performance.now();
  const reads = cellsOk ? await reader.readCells(grays) : [];
  // The first run warms onnxruntime up (allocations, kernel choice): not counted.
  if (s > 0) {
    readerMs += performance.now() - t0;
    readerCells += grays.length;
  }
  const clean = removeDashedRules(ruled);
  for (let i = 0; i < CELLS; i++) {
    const d = digits[i].digit;
    perDigit[d].n++;
    if (!cellsOk) continue;
    if (reads[i].digit === String(d)) perDigit[d].reader++;
    cellConfidences.push({ confidence: reads[i].confidence, right: reads[i].digit === String(d) });
    if (readerOnly) continue;
    const img = cellImage(clean, cells[i]);
    const r = img ? await engine.read(img, { mode: 'char', allowed: '0123456789' }) : null;
    if (r && r.text.replace(/\s+/g, '').slice(0, 1) === String(d)) perDigit[d].tesseract++;
  }

  // 2. fields, as extract reads them
  if (readerOnly) continue;
  const located: LocatedField = {
    field: spec,
    parts: [{ key: spec.name, box: strip.box, source: 'detection', detectionScore: 0.9, expected: null, region: null, reasons: [] }],
  };
  for (const which of ['ocr', 'both'] as const) {
    const outcome = await readLocatedField(located, type, options, { ocr: engine,
      page: strip.image,
      padding: 4,
      typeContext: { today: new Date() },
      digitReader: which === 'both' ? reader : undefined,
    });
    const result = buildFieldResult(located, outcome, 0.75, IDENTITY);
    const f = fields[which];
    const right = result.value === truth;
    decided[which].push({
      confidence: result.confidence,
      decidable: outcome.interpretation?.outcome === 'valid' && !result.reasons.some((r) => r.startsWith('ambiguous_')),
      right,
    });
    if (right) f.exact++;
    if (result.status === 'accepted') {
      f.accepted++;
      if (!right) f.wrongAccepted++;
    }
    if (which === 'both' && result.reasons.includes('ambiguous_digit_readers')) fields.both.disagree++;
    if (which === 'ocr') ocrConfidences.push({ ocr: result.scores.ocr ?? 0, right, valid: outcome.interpretation?.outcome === 'valid' });
    if (which === 'both') {
      const dc = outcome.details.digitCells as { agree: boolean; kept: string } | undefined;
      const words = outcome.reading?.kind === 'text' ? outcome.reading.words : [];
      fieldConfidences.push({
        weakest: words.length ? Math.min(...words.map((w) => w.confidence)) : 0,
        ocr: result.scores.ocr ?? 0,
        right,
        kept: dc?.kept ?? '-',
        agree: dc?.agree ?? false,
        status: result.status,
      });
    }
  }
  if ((s + 1) % 25 === 0) process.stderr.write(`strip ${s + 1}/${stripCount}\n`);
}
await reader.close();
await engine.close();

const pct = (a: number, b: number) => (b ? ((100 * a) / b).toFixed(2) : '-');
const total = perDigit.reduce((s, d) => s + d.n, 0);
const lines: string[] = [];
lines.push(`digit model ${args.model}${readerOnly ? ' (reader only: no Tesseract, no fields)' : ''}`);
lines.push(`digit-combs: ${stripCount} strips x ${CELLS} cells = ${total} test-split digits (${args.half}), seed ${seed}, degrade ${degrade}; cut failures ${cutFailures}`);
lines.push('digit  n    reader %  tesseract %');
for (let d = 0; d <= 9; d++) lines.push(`${d}      ${String(perDigit[d].n).padEnd(4)} ${pct(perDigit[d].reader, perDigit[d].n).padStart(8)}  ${pct(perDigit[d].tesseract, perDigit[d].n).padStart(10)}`);
const sum = (k: 'reader' | 'tesseract') => perDigit.reduce((s, d) => s + d[k], 0);
lines.push(`all    ${String(total).padEnd(4)} ${pct(sum('reader'), total).padStart(8)}  ${pct(sum('tesseract'), total).padStart(10)}`);
lines.push(`digit reader: ${(readerMs / Math.max(1, readerCells)).toFixed(3)} ms per cell (batches of ${CELLS}, one core, preprocessing included)`);
if (!readerOnly) for (const which of ['ocr', 'both'] as const) {
  const f = fields[which];
  lines.push(
    `fields ${which === 'ocr' ? 'tesseract alone      ' : 'tesseract + digits   '}: exact ${pct(f.exact, stripCount)} %, accepted ${pct(f.accepted, stripCount)} %, wrong among accepted ${pct(f.wrongAccepted, f.accepted)} % (${f.wrongAccepted}/${f.accepted})` +
      (which === 'both' ? `, disagreements ${fields.both.disagree}` : ''),
  );
}
if (args['fit-from']) {
  // As `formglean calibrate` does for a schema: the lowest threshold at which the development strips' accepted fields
  // are at most 1 % wrong, then measured here.
  const dev = JSON.parse(await readFile(args['fit-from'], 'utf8')) as { decided: typeof decided };
  for (const which of ['ocr', 'both'] as const) {
    const t = fitThreshold(dev.decided[which], 0.01);
    const acc = decided[which].filter((x) => x.decidable && x.confidence >= t);
    lines.push(
      `fields ${which === 'ocr' ? 'tesseract alone      ' : 'tesseract + digits   '} at threshold ${t.toFixed(3)} fitted on ${args['fit-from']}: ` +
        `accepted ${pct(acc.length, stripCount)} %, wrong among accepted ${pct(acc.filter((x) => !x.right).length, acc.length)} % (${acc.filter((x) => !x.right).length}/${acc.length})`,
    );
  }
}
lines.push(`${((performance.now() - started) / 1000).toFixed(0)} s`);
process.stdout.write(lines.join('\n') + '\n');
if (args.json) await writeJsonAtomic(args.json, { seed, degrade, strips: stripCount, perDigit, cutFailures, msPerCell: readerMs / Math.max(1, readerCells), fields, decided, cellConfidences, fieldConfidences, ocrConfidences });
