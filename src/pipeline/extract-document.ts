import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { Detection, Detector } from '../detect/types.js';
import { legibilityFactors } from '../fields/legibility.js';
import type { ReasonCode } from '../fields/reasons.js';
import type { DecodeLimits } from '../input/decode.js';
import { DEFAULT_LIMITS, openDocument } from '../input/decode.js';
import { DEFAULT_LOCATE, locateFields, type LocatedField } from '../locate/locate-fields.js';
import type { Alignment } from '../page/alignment.js';
import { dropoutForm } from '../page/dropout.js';
import { invertAffine, type Affine } from '../image/geometry.js';
import type { NormalizedPage } from '../page/normalize.js';
import { normalizePage } from '../page/normalize.js';
import type { GrayImage } from '../image/raster.js';
import type { DocumentResult, FieldResult, LayoutReview, PageResult } from '../result/document.js';
import { countStatuses, RESULT_FORMAT } from '../result/document.js';
import { statusInUnknownLayout, unreadStatus, type UnreadCause } from '../fields/scoring.js';
import type { FieldSpec } from '../schema/definition.js';
import type { LoadedSchema } from '../schema/load.js';
import { documentError } from '../errors.js';
import { recordedPath } from '../results/recorded-path.js';
import { alignmentProblem, boxOnPage, pageProblem } from './page-gate.js';
import { alignmentRecord, alignToSchemaPage } from './align-page.js';
import type { LayoutChoice } from './choose-layout.js';
import { chooseLayout } from './choose-layout.js';
import { confirmUpright } from './confirm-upright.js';
import { buildFieldResult } from './field-result.js';
import { readLocatedField, type FieldReadOutcome } from './read-field.js';
import { ReferencePages } from './reference-pages.js';
import { refineRegionParts } from './refine-regions.js';
import { settleScripts } from './second-read.js';
import type { DigitReader } from '../read/digit-reader.js';
import type { OcrEngine } from '../read/ocr-engine.js';
import { StageClock, type StageTimes } from '../results/stage-times.js';

export interface ExtractOptions {
  /** One schema, or several: each document is assigned to the layout its first page aligns with best. */
  schema: LoadedSchema | readonly LoadedSchema[];
  detector: Detector;
  /** The OCR engine every text read goes through; the caller creates and closes it, as it does the detector. */
  ocr: OcrEngine;
  /** Id used for the result's file name; default: the file name without extension. */
  documentId?: string;
  /**
   * The input's path as the record writes it; default: recordedPath(input) in this process's working folder. A queue
   * worker runs elsewhere and passes the path the submitting machine recorded, so every record of a batch agrees.
   */
  recordedAs?: string;
  /** Correct small skew (default true). */
  deskew?: boolean;
  /** Detect and correct quarter-turn rotation (default true). */
  orientation?: boolean;
  /** "Today" for date range checks (default: now). */
  today?: Date;
  limits?: DecodeLimits;
  /**
   * Read text from the page with the printed form subtracted (labels, rules and comb boxes gone), where the schema
   * names a blank reference image. Off by default: with the standard cleanup alone it lifts exact reads from 66.7 % to
   * 70.0 % (bench/dropout-gain.ts, heavy pages), but with the full read stage on the bundled light scans it measured
   * 91.8 % against 93.8 % without, at 3.8 s/page against 2.1 s. Worth trying on forms with heavy printed furniture.
   */
  dropout?: boolean;
  /** Digit reader for digit combs (src/read/digit-reader.ts); the caller opens and closes it. Absent: Tesseract alone. */
  digitReader?: DigitReader;
  /**
   * The schemas' blank pages, decoded by the caller that sets up a run of many files (ReferencePages.decode).
   * Absent: this call decodes them before its first page.
   */
  references?: ReferencePages;
  /**
   * A person's answer that the document is the form of the one schema given (review/layout-question.ts): the layout
   * is taken as assigned whatever its fit score, and the answer is kept in the record's layout block.
   */
  layoutFromReview?: LayoutReview;
}

export interface ExtractedDocument {
  result: DocumentResult;
  /** The form's decoded source pages, in which the result's boxes are given (for review crops and overlays). */
  pages: GrayImage[];
  /** Milliseconds this form spent in each stage (not part of the record: a re-run must write the same record). */
  stages: StageTimes;
}

interface PreparedPage {
  /** Page index in the file. */
  index: number;
  source: GrayImage;
  normalized: NormalizedPage;
  detections: Detection[];
  /** Milliseconds spent normalizing and detecting this page. */
  ms: number;
}

/**
 * One file through every stage: decode, gate, normalize, detect, choose layout, align, locate, read, score. A file
 * holds one form, or a stack of forms scanned together (a multi-page TIFF of single-page forms): after each form's
 * first page the layout says how many pages the form takes, and the next page starts the next form. Pages are
 * decoded one at a time and each form is handed on when read, so a long stack holds one form's pages at a time.
 * A page nothing can be read from (blank, black, too small: src/pipeline/page-gate.ts) fails the file with the reason.
 */
export async function* extractForms(input: string | Buffer, options: ExtractOptions): AsyncGenerator<ExtractedDocument> {
  const schemas = Array.isArray(options.schema) ? options.schema : [options.schema as LoadedSchema];
  const references = options.references ?? (await ReferencePages.decode(schemas));
  const doc = await openDocument(input, options.limits ?? DEFAULT_LIMITS);
  try {
    const prepare = async (index: number, clock: StageClock): Promise<PreparedPage> => {
      const source = await clock.time('decode', async () => {
        const page = await doc.page(index);
        const problem = pageProblem(page);
        if (problem) throw documentError(doc.source, `page ${index + 1} ${problem}`);
        return page;
      });
      const started = performance.now();
      const normalized = clock.timeSync('normalize', () =>
        normalizePage(source, { deskew: options.deskew ?? true, orientation: options.orientation ?? true }),
      );
      const detections = await clock.time('detect', () => options.detector.detect(normalized.image));
      return { index, source, normalized, detections, ms: performance.now() - started };
    };
    const stem = options.documentId ?? (typeof input === 'string' ? path.parse(input).name : doc.sha256.slice(0, 12));
    for (let first = 0; first < doc.pageCount; ) {
      const clock = new StageClock();
      const ocrBefore = options.ocr.busyMs;
      const head = await prepare(first, clock);
      const started = performance.now();
      const choose = () =>
        clock.time('align', () => chooseLayout(schemas, head.normalized.image, head.detections, references, options.layoutFromReview !== undefined));
      let choice = await choose();
      // Up versus down settled against the blank (src/pipeline/confirm-upright.ts); a first page turned over
      // chooses its layout again.
      const upright = options.orientation ?? true;
      // The layout choice registered this page by image already; its score stands for the upright registration.
      const known = choice.alignment.method.startsWith('image') ? choice.alignment.score : undefined;
      // The upright check's own detector runs count as alignment: they exist only to settle the page's turn.
      if (upright && (await clock.time('align', () => confirmUpright([head], choice.schema, references, options.detector, 0, known))).length > 0)
        choice = await choose();
      const count = Math.min(choice.schema.schema.pages.length, doc.pageCount - first);
      const formPages = [head];
      for (let i = 1; i < count; i++) formPages.push(await prepare(first + i, clock));
      if (upright && count > 1) await clock.time('align', () => confirmUpright(formPages, choice.schema, references, options.detector, 1));
      const stacked = first > 0 || first + count < doc.pageCount;
      const id = stacked ? `${stem}.p${first + 1}` : stem;
      const result = await extractForm(formPages, choice, schemas.length, {
        ...options,
        references,
        id,
        source: options.recordedAs ?? (typeof input === 'string' ? recordedPath(input) : '<buffer>'),
        sha256: doc.sha256,
        clock,
      });
      result.seconds = Math.round(performance.now() - started + formPages.reduce((a, p) => a + p.ms, 0)) / 1000;
      clock.ms.ocr = options.ocr.busyMs - ocrBefore;
      yield { result, pages: formPages.map((p) => p.source), stages: clock.ms };
      first += count;
    }
  } finally {
    doc.close();
  }
}

/** Every form of a file (see extractForms), read in full before returning. */
export async function extractFile(input: string | Buffer, options: ExtractOptions): Promise<ExtractedDocument[]> {
  const forms: ExtractedDocument[] = [];
  for await (const form of extractForms(input, options)) forms.push(form);
  return forms;
}

/** A file that holds exactly one form (the usual case): its record. */
export async function extractDocument(input: string | Buffer, options: ExtractOptions): Promise<ExtractedDocument> {
  const forms = await extractFile(input, options);
  return forms[0];
}

async function extractForm(
  formPages: readonly PreparedPage[],
  choice: LayoutChoice,
  candidates: number,
  options: ExtractOptions & { id: string; source: string; sha256: string; clock: StageClock; references: ReferencePages },
): Promise<DocumentResult> {
  const { detector, clock, references } = options;
  const loaded = choice.schema;
  const schema = loaded.schema;
  const typeContext = { today: options.today ?? new Date() };
  const fields: FieldResult[] = [];
  const pages: PageResult[] = [];
  const read: { lf: LocatedField; outcome: FieldReadOutcome; toSource: Affine; alignment: Alignment }[] = [];

  for (const [p, { normalized, detections, source, index }] of formPages.entries()) {
    const alignment: Alignment =
      p === 0 ? choice.alignment : await clock.time('align', () => alignToSchemaPage(loaded, p, normalized.image, detections, references));
    const misfit = alignmentProblem(alignment) !== null;
    pages.push({
      index: p,
      ...(index !== p ? { filePage: index } : {}),
      width: source.width,
      height: source.height,
      rotation: normalized.rotation,
      skew: Math.round(normalized.skew * 100) / 100,
      alignment: alignmentRecord(alignment),
      detections: detections.length,
    });
    const toSource = invertAffine(normalized.transform);
    const pageFields = loaded.fields.filter((f) => f.spec.page === p);
    // The page gate's second half: a page that does not fit its layout is not read (its boxes would be guesses,
    // some off the page); each of its fields goes to review.
    if (misfit) {
      const why: ReasonCode[] = choice.status === 'unknown_layout' ? ['unknown_layout', 'page_not_aligned'] : ['page_not_aligned'];
      fields.push(...pageFields.map((f) => unreadField(f.spec, 'page_not_aligned', ...why)));
      continue;
    }
    const { located, reference, ocrPage } = await clock.time('locate', async () => {
      const located = locateFields(pageFields, detections, alignment.refToPage, {
        ...DEFAULT_LOCATE,
        preferRegion: alignment.method === 'image' || alignment.method === 'image+detections',
      });
      const reference = references.page(loaded, p);
      if (reference) refineRegionParts(located, normalized.image, reference, alignment.refToPage);
      const ocrPage = options.dropout && reference ? dropoutForm(normalized.image, reference, alignment.refToPage).image : undefined;
      return { located, reference, ocrPage };
    });
    for (const [i, lf] of located.entries()) {
      if (lf.parts.some((part) => part.box && !boxOnPage(part.box, normalized.image))) {
        fields.push(unreadField(lf.field, 'off_page', 'off_page'));
        continue;
      }
      // locateFields answers field by field in the order given.
      const { type, options: typeOptions } = pageFields[i];
      const outcome = await clock.time('read', () =>
        readLocatedField(lf, type, typeOptions, {
          page: normalized.image,
          ocrPage,
          reference,
          padding: schema.defaults.padding,
          typeContext,
          digitReader: options.digitReader,
          ocr: options.ocr,
        }),
      );
      read.push({ lf, outcome, toSource, alignment });
    }
  }
  const scoreStarted = performance.now();

  // Scripts are decided once the whole form is read (one writer, one pen), and handwritten digits get their second read.
  await settleScripts(read.map((r) => r.outcome));
  // Scored once the whole form is read: each OCR field's confidence depends on how the others read.
  const legibility = legibilityFactors(read.map((r) => r.outcome));
  const heldBack: string[] = [];
  for (const [i, { lf, outcome, toSource, alignment }] of read.entries()) {
    const field = buildFieldResult(lf, outcome, schema.defaults.reviewThreshold, toSource, legibility[i], alignment);
    if (choice.status === 'unknown_layout') {
      field.reasons.push('unknown_layout');
      const held = statusInUnknownLayout(field.status);
      // Kept so that a reviewer's "yes, it is this form" gives these fields back their own status.
      if (held !== field.status) heldBack.push(field.name);
      field.status = held;
    }
    fields.push(field);
  }

  // Fields on pages the file does not have (a form cut short).
  for (const f of schema.fields.filter((x) => x.page >= formPages.length)) fields.push(unreadField(f, 'page_missing', 'page_missing'));
  const order = new Map(schema.fields.map((f, i) => [f.name, i]));
  fields.sort((a, b) => (order.get(a.name) ?? 0) - (order.get(b.name) ?? 0));
  clock.ms.score += performance.now() - scoreStarted;

  return {
    format: RESULT_FORMAT,
    document: { id: options.id, path: options.source, sha256: options.sha256 },
    schema: { name: schema.form.name, version: schema.form.version, path: loaded.path, sha256: loaded.sha256 },
    model: { id: detector.id, path: detector.path, sha256: detector.sha256 },
    ...(candidates > 1 || choice.status === 'unknown_layout' || options.layoutFromReview
      ? {
          layout: {
            status: choice.status,
            score: choice.score,
            candidates: choice.candidates,
            ...(heldBack.length ? { heldBack } : {}),
            ...(options.layoutFromReview ? { review: options.layoutFromReview } : {}),
          },
        }
      : {}),
    createdAt: new Date().toISOString(),
    pages,
    fields,
    counts: countStatuses(fields),
    seconds: 0,
  };
}

/** A field that was not read at all (its page is missing, does not fit the layout, or its box is off the page): no value, no box. */
function unreadField(f: FieldSpec, cause: UnreadCause, ...reasons: ReasonCode[]): FieldResult {
  const status = unreadStatus(cause, f.required ?? false);
  return { name: f.name, type: f.type, page: f.page, value: null, raw: null, status, confidence: 0, reasons, box: null, source: 'none', scores: {} };
}
