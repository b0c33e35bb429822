import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { Detector } from '../detect/types.js';
import { getFieldType } from '../fields/registry.js';
import type { DecodeLimits } from '../input/decode.js';
import { decodeDocument, DEFAULT_LIMITS } from '../input/decode.js';
import { locateFields } from '../locate/locate-fields.js';
import type { GrayImage } from '../page/raster.js';
import type { DocumentResult, FieldResult, PageResult } from '../result/document.js';
import { countStatuses, RESULT_FORMAT } from '../result/document.js';
import type { LoadedSchema } from '../schema/load.js';
import { alignPage } from './align-page.js';
import { buildFieldResult } from './field-result.js';
import { normalizePage } from './normalize-page.js';
import { readLocatedField } from './read-field.js';

export interface ExtractOptions {
  schema: LoadedSchema;
  detector: Detector;
  /** Id used for the result's file name; default: the file name without extension. */
  documentId?: string;
  /** Remove small skew before detection (default true). */
  deskew?: boolean;
  /** "Today" for date range checks (default: now). */
  today?: Date;
  limits?: DecodeLimits;
}

export interface ExtractedDocument {
  result: DocumentResult;
  /** Decoded source pages, in which the result's boxes are given (for review crops and overlays). */
  pages: GrayImage[];
}

/** One document through every stage: decode, normalize, detect, align, locate, read, validate, score. */
export async function extractDocument(input: string | Buffer, options: ExtractOptions): Promise<ExtractedDocument> {
  const started = performance.now();
  const { schema: loaded, detector } = options;
  const schema = loaded.schema;
  const decoded = await decodeDocument(input, options.limits ?? DEFAULT_LIMITS);
  const typeContext = { today: options.today ?? new Date() };
  const fields: FieldResult[] = [];
  const pages: PageResult[] = [];

  for (let p = 0; p < decoded.pages.length; p++) {
    const page = normalizePage(p, decoded.pages[p], { deskew: options.deskew ?? true });
    const reference = schema.pages[p];
    const pageFields = schema.fields.filter((f) => f.page === p);
    const detections = await detector.detect(page.image);
    const alignment = reference
      ? alignPage(pageFields, detections, reference, page.image)
      : null;
    pages.push({
      index: p,
      width: page.source.width,
      height: page.source.height,
      rotation: page.rotation,
      skew: Math.round(page.skew * 100) / 100,
      alignment: alignment?.record ?? null,
      detections: detections.length,
    });
    if (!alignment) continue; // a page the schema does not describe
    const located = locateFields(pageFields, detections, alignment.refToPage);
    for (const lf of located) {
      const type = getFieldType(lf.field.type);
      const typeOptions = type.options.parse(lf.field.options ?? {});
      const outcome = await readLocatedField(lf, type, typeOptions, {
        page: page.image,
        padding: schema.defaults.padding,
        typeContext,
      });
      const threshold = lf.field.reviewThreshold ?? schema.defaults.reviewThreshold;
      fields.push(buildFieldResult(lf, outcome, threshold, page.toSource));
    }
  }

  // Fields on pages the document does not have.
  for (const f of schema.fields.filter((x) => x.page >= decoded.pages.length)) {
    fields.push({
      name: f.name,
      type: f.type,
      page: f.page,
      value: null,
      raw: null,
      status: f.required ? 'missing' : 'review',
      confidence: 0,
      reasons: ['page_missing'],
      box: null,
      source: 'none',
      scores: {},
    });
  }
  const order = new Map(schema.fields.map((f, i) => [f.name, i]));
  fields.sort((a, b) => (order.get(a.name) ?? 0) - (order.get(b.name) ?? 0));

  const source = typeof input === 'string' ? path.resolve(input) : '<buffer>';
  const id = options.documentId ?? (typeof input === 'string' ? path.parse(input).name : decoded.sha256.slice(0, 12));
  const result: DocumentResult = {
    format: RESULT_FORMAT,
    document: { id, path: source, sha256: decoded.sha256 },
    schema: { name: schema.form.name, version: schema.form.version, path: loaded.path, sha256: loaded.sha256 },
    model: { id: detector.id, path: detector.path, sha256: detector.sha256 },
    createdAt: new Date().toISOString(),
    pages,
    fields,
    counts: countStatuses(fields),
    seconds: Math.round((performance.now() - started)) / 1000,
  };
  return { result, pages: decoded.pages };
}
