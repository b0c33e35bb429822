import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { FieldSource } from '../../draft/from-pdf/assemble.js';
import { draftFromPdf, formNameOf, writePdfSchema, type PdfSchemaDraft } from '../../draft/from-pdf/from-pdf.js';
import { configError } from '../../errors.js';
import { renderPdfPage } from '../../input/pdf.js';
import { writeFileAtomic, writeJsonAtomic } from '../../io/atomic-write.js';
import type { GrayImage } from '../../image/raster.js';
import { unionBox } from '../../image/geometry.js';
import { boxTuple } from '../../image/box-tuple.js';
import { CocoBuilder } from '../coco.js';
import { encodePage } from '../encode-page.js';
import { drawPen, type FillMode } from '../fill.js';
import { scanBox } from '../homography.js';
import type { DetectorClass, FieldTypeName } from '../layout-model.js';
import { pageSeed, Rng } from '../prng.js';
import { rasterizeSvg } from '../rasterize.js';
import { drawScanParams, type DegradeLevel, type ScanParams } from '../scan-params.js';
import { simulateScan } from '../scan-simulate.js';
import { svgDocument } from '../../image/svg.js';
import type { PageTruth, TruthField } from '../truth.js';
import { handwritingSvg, signaturesSvg, type CombCellDrawer } from './handwriting.js';
import { planFill, type PdfFieldFill } from './plan.js';
import { realDigitCell } from './real-digits.js';
import { typedPdf } from './typed.js';

export interface FillPdfOptions {
  /** The fillable PDF. */
  form: string;
  /** 0-based page. */
  page: number;
  count: number;
  seed: number;
  out: string;
  degrade: DegradeLevel;
  /** Share of pages fed upside down (when degrading). */
  upsideDownRate: number;
  /** Which pages are typed: all, none, or every other one starting with typed (half and half). */
  fill: 'typed' | 'handwriting' | 'mixed';
  /** Optional drawer for the characters of comb cells (and the digits of digit-only fields) on handwriting pages. */
  drawCombCell?: CombCellDrawer;
  /** Digits on handwriting pages, in comb cells and digit-only fields, are real handwriting from the MNIST test
   *  split (real-digits.ts); ignored when drawCombCell is given. */
  realDigits?: boolean;
}

export interface FillPdfSummary {
  form: string;
  schema: string;
  pages: number;
  annotations: number;
  seconds: number;
}

/** Family name recorded in the truth of pages made from a fillable PDF. */
export const PDF_FAMILY = 'fillable-pdf';

/** Ink of typed pages' signatures and of the pen. Dark but not black (common practice for ballpoint ink). */
const SIGNATURE_INK = 35;

function darkest(a: GrayImage, b: GrayImage): GrayImage {
  const out = new Uint8Array(a.data.length);
  for (let i = 0; i < out.length; i++) out[i] = a.data[i] < b.data[i] ? a.data[i] : b.data[i];
  return { width: a.width, height: a.height, data: out };
}

function pdfTruthField(f: PdfFieldFill, scan: ScanParams, handwriting: boolean): TruthField {
  const src = f.src;
  const boxes = src.boxes.map((b) => scanBox(scan.transform, b, scan.width, scan.height));
  const out: TruthField = {
    name: src.field.name,
    type: src.field.type as FieldTypeName,
    class: src.field.class as DetectorClass,
    page: 0,
    value: f.value,
    text: f.text,
    box: boxTuple(unionBox(boxes)),
  };
  if (src.kind === 'checkbox' && f.marks && handwriting) out.mark = f.marks[0];
  if (src.kind === 'choice' && f.marks) {
    const marks = f.marks;
    out.parts = src.values!.map((key, i) => ({ key, box: boxTuple(boxes[i]), mark: handwriting ? marks[i] : key === f.value ? 'tick' : 'empty', checked: key === f.value }));
  }
  return out;
}

/** Entry areas of the schema for COCO labels: one per widget (each option of a choice group on its own). */
export function entryAreas(sources: readonly FieldSource[]): { class: DetectorClass; box: FieldSource['boxes'][number] }[] {
  return sources.flatMap((s) => s.boxes.map((box) => ({ class: s.field.class as DetectorClass, box })));
}

/** One filled, scanned page with its truth. */
export async function fillPage(bytes: Uint8Array, draft: PdfSchemaDraft, o: FillPdfOptions, index: number, name: string) {
  const seedOfPage = pageSeed(o.seed, index, name);
  const rng = new Rng(seedOfPage);
  const mode: FillMode = o.fill === 'mixed' ? (index % 2 === 0 ? 'typed' : 'handwriting') : o.fill;
  const fills = planFill(draft.sources, rng.fork('fill'));
  const { width, height } = draft.blank;
  let base: GrayImage;
  let ink: string;
  let pen: string;
  const typed = mode === 'typed' ? await typedPdf(bytes, o.form, fills) : null;
  if (typed) {
    base = await renderPdfPage(typed, o.form, draft.page, draft.dpi);
    ink = signaturesSvg(fills, rng.fork('ink'), SIGNATURE_INK);
    pen = 'pdf-appearance';
  } else {
    // Handwriting; or typed values drawn over the blank in a typewriter font, for the few forms whose own fields
    // pdf-lib cannot flatten.
    base = draft.blank;
    const p = drawPen(rng.fork('pen'), mode);
    ink = handwritingSvg(fills, p, rng.fork('ink'), o.drawCombCell ?? (o.realDigits ? realDigitCell : undefined));
    pen = mode === 'typed' ? `${p.font}-overlay` : p.font;
  }
  if (base.width !== width || base.height !== height) throw configError(o.form, 'the filled page rendered at another size than the blank');
  if (ink !== '') base = darkest(base, await rasterizeSvg(svgDocument(width, height, ink)));
  const scan = drawScanParams(rng.fork('scan'), width, height, { level: o.degrade, upsideDownRate: o.upsideDownRate });
  const image = await simulateScan(base, scan, rng.fork('noise'));
  const stem = `${name}-${o.seed}-${String(index).padStart(5, '0')}`;
  const truth: PageTruth = {
    layout: name,
    family: PDF_FAMILY,
    seed: seedOfPage,
    index,
    file: `${stem}.png`,
    width: scan.width,
    height: scan.height,
    dpi: scan.dpi,
    rotation: scan.rotation,
    skew: scan.skew,
    fill: mode,
    pen,
    fields: fills.map((f) => pdfTruthField(f, scan, mode === 'handwriting')),
  };
  return { stem, image, scan, truth };
}

/**
 * Filled test pages from a fillable PDF: the schema drafted from its widgets (written to OUT/<form>.yaml with its
 * blank), then `count` pages with invented values, half typed through the form's own fields and half written in
 * the handwriting fonts, scanned by the simulator; truth/<stem>.json per page and coco.json. Page i depends only on
 * (seed, i).
 */
export async function fillPdfSamples(o: FillPdfOptions, onPage?: (index: number) => void): Promise<FillPdfSummary> {
  const started = performance.now();
  let bytes: Uint8Array;
  try {
    bytes = await readFile(o.form);
  } catch (err) {
    throw configError(o.form, `cannot read (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  const name = formNameOf(o.form);
  const draft = await draftFromPdf(o.form, { page: o.page, image: `${name}.blank.png`, bytes });
  const written = await writePdfSchema(draft, path.join(o.out, `${name}.yaml`));
  const coco = new CocoBuilder();
  const areas = entryAreas(draft.sources);
  for (let index = 0; index < o.count; index++) {
    const page = await fillPage(bytes, draft, o, index, name);
    await writeFileAtomic(path.join(o.out, `${page.stem}.png`), await encodePage(page.image, 'png', page.scan.dpi));
    await writeJsonAtomic(path.join(o.out, 'truth', `${page.stem}.json`), page.truth);
    coco.addAreas(`${page.stem}.png`, areas, page.scan);
    onPage?.(index);
  }
  await writeJsonAtomic(path.join(o.out, 'coco.json'), coco.build(`formglean filled ${name} seed ${o.seed}`));
  return { form: name, schema: written.schema, pages: o.count, annotations: coco.annotationCount, seconds: (performance.now() - started) / 1000 };
}
