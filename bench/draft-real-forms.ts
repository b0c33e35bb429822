/**
 * Schema drafting from an image on real blanks: `npx tsx bench/draft-real-forms.ts --half dev` (development half:
 * choose heuristics here) or `--half held-out` (report figures here; never tune on it).
 *
 * For every fillable PDF of the half (split fixed in bench/real-forms-split.json; forms folder default
 * ../shared/reference/real-forms/pdfs, relative to the repo root), each page with widgets (page 1 only unless
 * --pages all) is rendered blank at 200 DPI by PDFium, exactly as `schema from-pdf` draws it, and drafted by
 * src/draft/from-image.ts with the detector and the OCR engine, as `schema draft` does on a scanned blank. The
 * widget rectangles are the truth:
 *  - coverage: widget areas (each option of a radio group on its own) with a drafted area at IoU >= 0.5 (PASCAL
 *    VOC's criterion, Everingham et al. 2010), matched one to one, best IoU first;
 *  - spurious: drafted areas matched to no widget area;
 *  - names: of the drafted fields matched to a widget whose tooltip (/TU) reads as words (with --name-truth also
 *    those whose own field name does, as "committee_name"), the share whose name words (three letters or more; the
 *    numeric suffix of a repeated name left out) all appear among those words: the form author's words for the
 *    printed label.
 *    A name that lost its first letter to a checkbox detection ("ull_name") fails it. Fields named after the class
 *    (no label found) count as not matching.
 *  - unsure: fields `schema draft` lists for the user to check.
 * Options: --half dev|held-out|all (default dev), --pages first|all, --model FILE, --forms DIR, --only a,b, --json F,
 * --verbose (per-field lines: name, tooltip words; never a field value: blanks hold none).
 */
import { readFile } from 'node:fs/promises';
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { draftFromPdf } from '../src/draft/from-pdf/from-pdf.js';
import { isMeaningfulName, isReadableTooltip, partialName, tooltipCore, words } from '../src/draft/from-pdf/naming.js';
import { loadPdf, readPageWidgets } from '../src/draft/from-pdf/widgets.js';
import { draftedAreas } from '../src/draft/drafted-field.js';
import { draftSchema } from '../src/draft/from-image.js';
import { unsureFields } from '../src/draft/unsure.js';
import type { Box } from '../src/image/geometry.js';
import { iou } from '../src/image/geometry.js';
import { writeJsonAtomic } from '../src/io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { OcrEngine } from '../src/read/ocr-engine.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const { values: args } = parseArgs({
  options: {
    half: { type: 'string', default: 'dev' },
    pages: { type: 'string', default: 'first' },
    model: { type: 'string', default: DEFAULT_MODEL_PATH },
    forms: { type: 'string', default: path.join(ROOT, '..', 'shared', 'reference', 'real-forms', 'pdfs') },
    only: { type: 'string' },
    json: { type: 'string' },
    verbose: { type: 'boolean', default: false },
    'name-truth': { type: 'boolean', default: false },
  },
});
if (!['dev', 'held-out', 'all'].includes(args.half!)) throw new Error(`--half: dev, held-out or all; got "${args.half}"`);
if (!['first', 'all'].includes(args.pages!)) throw new Error(`--pages: first or all; got "${args.pages}"`);

const split = JSON.parse(await readFile(path.join(ROOT, 'bench', 'real-forms-split.json'), 'utf8')) as { development: string[]; heldOut: string[] };
let files = args.half === 'dev' ? split.development : args.half === 'held-out' ? split.heldOut : [...split.development, ...split.heldOut].sort();
if (args.only) {
  const only = new Set(args.only.split(',').map((s) => s.trim().replace(/\.pdf$/i, '')));
  files = files.filter((f) => only.has(f.replace(/\.pdf$/i, '')));
}
const present = new Set(readdirSync(args.forms!));
files = files.filter((f) => present.has(f));

interface Truth {
  box: Box;
  className: string;
  tooltipWords: Set<string> | null;
}

interface Row {
  form: string;
  page: number;
  widgets: number;
  drafted: number;
  covered: number;
  sameClass: number;
  spurious: number;
  named: number;
  namedRight: number;
  unsure: number;
  /** Checkbox detections without a printed square or circle (letters, brackets, bullets), other detections without a rule. */
  noMark: number;
  noRule: number;
  seconds: number;
}

const detector = await loadDetector(args.model!);
const ocr = new OcrEngine();
const rows: Row[] = [];
let checkboxDetections = 0;
/** Name words that carry meaning: three letters or more, no digits (the _2 of a repeated name is left out). */
const nameWords = (name: string) => name.split('_').filter((w) => /^[a-z]{3,}$/.test(w));
try {
  for (const file of files) {
    const full = path.join(args.forms!, file);
    const bytes = await readFile(full);
    const doc = await loadPdf(bytes, full);
    const pageCount = doc.getPageCount();
    const pages = args.pages === 'first' ? [0] : [...Array(pageCount).keys()].filter((p) => readPageWidgets(doc, p, full).widgets.length > 0);
    for (const p of pages) {
      const t0 = performance.now();
      let pdf;
      try {
        pdf = await draftFromPdf(full, { page: p, image: 'blank.png', bytes });
      } catch (err) {
        process.stderr.write(`${file} page ${p + 1}: ${(err as Error).message}\n`);
        continue;
      }
      const truth: Truth[] = pdf.sources.flatMap((s) =>
        s.boxes.map((box, i) => {
          const w = s.widgets[i] ?? s.widgets[0];
          // The tooltip is the form author's wording of the printed label; a field's own name is often a code or an
          // abbreviation ("is_nok" for "I am the deceased veteran's next of kin"), so it is used only on request.
          const partial = partialName(w.fieldName);
          const source = isReadableTooltip(w.tooltip) ? w.tooltip : args['name-truth'] && isMeaningfulName(partial) ? partial : null;
          return { box, className: s.field.class, tooltipWords: source === null ? null : new Set(words(tooltipCore(source)).concat(words(source))) };
        }),
      );
      const dets = await detector.detect(pdf.blank);
      checkboxDetections += dets.filter((d) => d.className === 'checkbox').length;
      const draft = await draftSchema([pdf.blank], [dets], async (c) => (await ocr.read(c, { mode: 'line' })).text, {
        formName: 'bench',
        referenceImages: [undefined],
      });
      const areas = draftedAreas(draft.fields);
      // One-to-one matching, best IoU first.
      const pairs: Array<[number, number, number]> = [];
      areas.forEach((a, ai) => truth.forEach((t, ti) => {
        const o = iou(a.box, t.box);
        if (o >= 0.5) pairs.push([o, ai, ti]);
      }));
      pairs.sort((x, y) => y[0] - x[0]);
      const usedA = new Set<number>();
      const usedT = new Set<number>();
      let sameClass = 0;
      let named = 0;
      let namedRight = 0;
      for (const [, ai, ti] of pairs) {
        if (usedA.has(ai) || usedT.has(ti)) continue;
        usedA.add(ai);
        usedT.add(ti);
        const a = areas[ai];
        const t = truth[ti];
        if (a.className === t.className) sameClass++;
        if (t.tooltipWords && a.field.type !== 'choice') {
          named++;
          const ws = nameWords(a.field.name);
          const right = a.field.label !== null && ws.length > 0 && ws.every((w) => t.tooltipWords!.has(w));
          if (right) namedRight++;
          if (args.verbose) process.stdout.write(`  ${right ? 'ok ' : 'BAD'} ${a.field.name}  <-  ${[...t.tooltipWords].slice(0, 12).join(' ')}\n`);
        }
      }
      const row: Row = {
        form: file.replace(/\.pdf$/i, ''),
        page: p + 1,
        widgets: truth.length,
        drafted: areas.length,
        covered: usedT.size,
        sameClass,
        spurious: areas.length - usedA.size,
        named,
        namedRight,
        unsure: unsureFields(draft.fields).length,
        noMark: draft.dropped.checkboxWithoutMark,
        noRule: draft.dropped.withoutRule,
        seconds: (performance.now() - t0) / 1000,
      };
      rows.push(row);
      process.stdout.write(
        `${row.form} p${row.page}: widgets ${row.widgets}, drafted ${row.drafted}, covered ${row.covered} (${row.sameClass} same class), ` +
          `spurious ${row.spurious}, names ${row.namedRight}/${row.named}, unsure ${row.unsure}, dropped: ${row.noMark} checkboxes without a printed mark, ${row.noRule} areas without a rule, ${row.seconds.toFixed(1)} s\n`,
      );
    }
  }
} finally {
  await detector.close();
  await ocr.close();
}
const sum = (k: keyof Row) => rows.reduce((s, r) => s + (r[k] as number), 0);
const pct = (a: number, b: number) => (b > 0 ? `${((100 * a) / b).toFixed(1)} %` : '-');
const total = {
  half: args.half,
  pages: rows.length,
  widgets: sum('widgets'),
  drafted: sum('drafted'),
  covered: sum('covered'),
  spurious: sum('spurious'),
  named: sum('named'),
  namedRight: sum('namedRight'),
  unsure: sum('unsure'),
  checkboxDetections,
  noMark: sum('noMark'),
  noRule: sum('noRule'),
};
process.stdout.write(
  `\n${args.half} half, ${rows.length} page(s), model ${path.basename(args.model!)}: coverage ${total.covered}/${total.widgets} = ${pct(total.covered, total.widgets)}; ` +
    `spurious ${total.spurious}/${total.drafted} = ${pct(total.spurious, total.drafted)}; names matching the label ${total.namedRight}/${total.named} = ${pct(total.namedRight, total.named)}; ` +
    `listed as unsure ${total.unsure}; checkbox detections on print (no printed square or circle) ${total.noMark}/${total.checkboxDetections} = ${pct(total.noMark, total.checkboxDetections)}; ` +
    `other detections without a rule ${total.noRule}\n`,
);
if (args.json) await writeJsonAtomic(args.json, { total, rows });
