import { createHash } from 'node:crypto';
import type { DocumentResult, FieldResult } from '../../src/result/document.js';
import { countStatuses, RESULT_FORMAT } from '../../src/result/document.js';

/** A field result as extraction would write it; every value here is invented demo data. */
export function field(name: string, type: string, value: FieldResult['value'], status: FieldResult['status'], more: Partial<FieldResult> = {}): FieldResult {
  return {
    name,
    type,
    page: 0,
    value,
    raw: value === null ? '' : String(value),
    status,
    confidence: status === 'accepted' ? 0.97 : 0.41,
    reasons: status === 'accepted' ? [] : ['low_ocr_confidence'],
    box: { page: 0, x: 40, y: 40, w: 200, h: 30 },
    source: 'detection',
    scores: { detection: 0.9, ocr: status === 'accepted' ? 0.95 : 0.4 },
    ...more,
  };
}

/** A document result with the given fields; the content hash derives from the id so each document differs. */
export function documentResult(id: string, fields: FieldResult[], schemaPath = '/nonexistent/schema.yaml', schemaSha256 = 'a'.repeat(64)): DocumentResult {
  return {
    format: RESULT_FORMAT,
    document: { id, path: `/scans/${id}.png`, sha256: createHash('sha256').update(`scan ${id}`).digest('hex') },
    schema: { name: 'clinic-intake', version: '1', path: schemaPath, sha256: schemaSha256 },
    model: { id: 'form-elements', path: 'models/form-elements.onnx', sha256: 'b'.repeat(64) },
    createdAt: '2026-03-02T10:00:00.000Z',
    pages: [{ index: 0, width: 800, height: 600, rotation: 0, skew: 0, alignment: null, detections: fields.length }],
    fields,
    counts: countStatuses(fields),
    seconds: 1.5,
  };
}
