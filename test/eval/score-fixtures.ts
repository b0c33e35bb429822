import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { DocumentResult, FieldResult } from '../../src/result/document.js';
import { countStatuses } from '../../src/result/document.js';
import type { TruthDocument, TruthField } from '../../src/result/truth.js';

const made: string[] = [];

/** Invented demo data only: fictional names, 555-01xx phone numbers. */
export async function tempDir(prefix: string): Promise<string> {
  await mkdir(path.resolve('.tmp'), { recursive: true });
  const dir = await mkdtemp(path.join(path.resolve('.tmp'), prefix));
  made.push(dir);
  return dir;
}

/** Remove the folders tempDir made (call from afterAll). */
export async function removeTempDirs(): Promise<void> {
  await Promise.all(made.splice(0).map((d) => rm(d, { recursive: true, force: true })));
}

export function truthDoc(layout: string, fill: TruthDocument['fill'], fields: TruthField[]): TruthDocument {
  return { layout, seed: 900001, index: 0, width: 1000, height: 1300, rotation: 0, skew: 0, fill, fields };
}

export function truthField(
  name: string,
  type: string,
  value: TruthField['value'],
  text: string | null,
  box: [number, number, number, number],
): TruthField {
  return { name, type, class: type === 'checkbox' ? 'checkbox' : 'text_entry', page: 0, value, text, box };
}

export function resultField(
  name: string,
  type: string,
  value: FieldResult['value'],
  raw: string | null,
  status: FieldResult['status'],
  confidence: number,
  box: { x: number; y: number; w: number; h: number } | null,
): FieldResult {
  return {
    name,
    type,
    page: 0,
    value,
    raw,
    status,
    confidence,
    reasons: status === 'review' ? ['low_ocr_confidence'] : [],
    box: box ? { page: 0, ...box } : null,
    source: box ? 'detection' : 'none',
    scores: { ocr: confidence },
  };
}

export function documentResult(imagePath: string, schemaName: string, fields: FieldResult[]): DocumentResult {
  const id = path.parse(imagePath).name;
  return {
    format: 1,
    document: { id, path: imagePath, sha256: '0'.repeat(64) },
    schema: { name: schemaName, version: '1', path: `schemas/${schemaName}.yaml`, sha256: '1'.repeat(64) },
    model: { id: 'form-elements', path: 'models/form-elements.onnx', sha256: '2'.repeat(64) },
    createdAt: '2026-01-05T10:00:00.000Z',
    pages: [{ index: 0, width: 1000, height: 1300, rotation: 0, skew: 0, alignment: null, detections: fields.length }],
    fields,
    counts: countStatuses(fields),
    seconds: 1.5,
  };
}

/** Write truth files as samples generate does (DIR/truth/<stem>.json) and results as extract does. */
export async function writeSet(
  truth: Record<string, TruthDocument>,
  results: Record<string, DocumentResult>,
  failed: string[] = [],
): Promise<{ truthDir: string; resultsDir: string }> {
  const truthDir = await tempDir('score-truth-');
  const resultsDir = await tempDir('score-results-');
  await mkdir(path.join(truthDir, 'truth'));
  for (const [stem, t] of Object.entries(truth)) {
    await writeFile(path.join(truthDir, 'truth', `${stem}.json`), JSON.stringify(t));
  }
  await writeFile(path.join(truthDir, 'coco.json'), JSON.stringify({ images: [], annotations: [], categories: [] }));
  const lines: string[] = [];
  for (const [id, r] of Object.entries(results)) {
    await writeFile(path.join(resultsDir, `${id}.json`), JSON.stringify(r));
    lines.push(JSON.stringify({ document: id, path: r.document.path, ok: true, json: `${id}.json` }));
  }
  for (const stem of failed) {
    lines.push(JSON.stringify({ document: stem, path: `/scans/${stem}.png`, ok: false, error: 'cannot decode' }));
  }
  await writeFile(path.join(resultsDir, 'results.jsonl'), lines.join('\n') + '\n');
  await writeFile(path.join(resultsDir, 'summary.json'), JSON.stringify({ documents: { total: lines.length } }));
  return { truthDir, resultsDir };
}
