import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { Detection, Detector } from '../detect/types.js';
import { getFieldType } from '../fields/registry.js';
import type { DecodeLimits } from '../input/decode.js';
import { decodeDocument, DEFAULT_LIMITS } from '../input/decode.js';
import { locateFields } from '../locate/locate-fields.js';
import type { Alignment } from '../page/alignment.js';
import { invertAffine } from '../page/geometry.js';
import type { NormalizedPage } from '../page/normalize.js';
import { normalizePage } from '../page/normalize.js';
import type { GrayImage } from '../page/raster.js';
import type { DocumentResult, FieldResult, PageResult } from '../result/document.js';
import { countStatuses, RESULT_FORMAT } from '../result/document.js';
import type { LoadedSchema } from '../schema/load.js';
import { alignmentRecord, alignToSchemaPage } from './align-page.js';
import { chooseLayout } from './choose-layout.js';
import { buildFieldResult } from './field-result.js';
import { readLocatedField } from './read-field.js';

export interface ExtractOptions {
  /** One schema, or several: each document is assigned to the layout its first page aligns with best. */
  schema: LoadedSchema | readonly LoadedSchema[];
  detector: Detector;
  /** Id used for the result's file name; default: the file name without extension. */
  documentId?: string;
  /** Correct small skew (default true). */
  deskew?: boolean;
  /** Detect and correct quarter-turn rotation (default true). */
  orientation?: boolean;
  /** "Today" for date range checks (default: now). */
  today?: Date;
  limits?: DecodeLimits;
}

export interface ExtractedDocument {
  result: DocumentResult;
  /** Decoded source pages, in which the result's boxes are given (for review crops and overlays). */
  pages: GrayImage[];
}

interface PreparedPage {
  normalized: NormalizedPage;
  detections: Detection[];
}

/** One document through every stage: decode, normalize, detect, choose layout, align, locate, read, score. */
export async function extractDocument(input: string | Buffer, options: ExtractOptions): Promise<ExtractedDocument> {
  const started = performance.now();
  const schemas = Array.isArray(options.schema) ? options.schema : [options.schema as LoadedSchema];
  const { detector } = options;
  const decoded = await decodeDocument(input, options.limits ?? DEFAULT_LIMITS);

  const prepared: PreparedPage[] = [];
  for (const source of decoded.pages) {
    const normalized = normalizePage(source, { deskew: options.deskew ?? true, orientation: options.orientation ?? true });
    prepared.push({ normalized, detections: await detector.detect(normalized.image) });
  }

  const choice = await chooseLayout(schemas, prepared[0].normalized.image, prepared[0].detections);
  const loaded = choice.schema;
  const schema = loaded.schema;
  const typeContext = { today: options.today ?? new Date() };
  const fields: FieldResult[] = [];
  const pages: PageResult[] = [];

  for (const [p, { normalized, detections }] of prepared.entries()) {
    const reference = schema.pages[p];
    const alignment: Alignment | null = !reference
      ? null
      : p === 0
        ? choice.alignment
        : await alignToSchemaPage(loaded, p, normalized.image, detections);
    pages.push({
      index: p,
      width: decoded.pages[p].width,
      height: decoded.pages[p].height,
      rotation: normalized.rotation,
      skew: Math.round(normalized.skew * 100) / 100,
      alignment: alignment ? alignmentRecord(alignment) : null,
      detections: detections.length,
    });
    if (!alignment) continue; // a page the schema does not describe
    const toSource = invertAffine(normalized.transform);
    const pageFields = schema.fields.filter((f) => f.page === p);
    for (const lf of locateFields(pageFields, detections, alignment.refToPage)) {
      const type = getFieldType(lf.field.type);
      const typeOptions = type.options.parse(lf.field.options ?? {});
      const outcome = await readLocatedField(lf, type, typeOptions, {
        page: normalized.image,
        padding: schema.defaults.padding,
        typeContext,
      });
      const threshold = lf.field.reviewThreshold ?? schema.defaults.reviewThreshold;
      const field = buildFieldResult(lf, outcome, threshold, toSource);
      if (choice.status === 'unknown_layout') {
        field.reasons.push('unknown_layout');
        if (field.status === 'accepted') field.status = 'review';
      }
      fields.push(field);
    }
  }

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
    ...(schemas.length > 1
      ? { layout: { status: choice.status, score: Math.round(choice.alignment.score * 1000) / 1000, candidates: choice.candidates } }
      : {}),
    createdAt: new Date().toISOString(),
    pages,
    fields,
    counts: countStatuses(fields),
    seconds: Math.round(performance.now() - started) / 1000,
  };
  return { result, pages: decoded.pages };
}
