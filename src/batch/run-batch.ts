import { createHash } from 'node:crypto';
import { mkdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Detector } from '../detect/types.js';
import { FormgleanError, oneLine } from '../errors.js';
import { writeJsonAtomic } from '../io/atomic-write.js';
import { extractDocument } from '../pipeline/extract-document.js';
import type { DocumentResult } from '../result/document.js';
import { DocumentResult as DocumentResultSchema } from '../result/document.js';
import { writeReviewCrops } from '../review/crops.js';
import { writeReviewQueue } from '../review/queue-write.js';
import type { LoadedSchema } from '../schema/load.js';
import { discoverInputs, documentIds } from './discover.js';
import type { BatchSummary, ResultsLine } from './sinks.js';
import { documentJsonName, failedLine, okLine, writeBatchOutputs } from './sinks.js';

export interface BatchOptions {
  inputs: readonly string[];
  /** One schema, or several (each document goes to the layout it aligns with best). */
  schemas: readonly LoadedSchema[];
  detector: Detector;
  outDir: string;
  /** Reuse a document's JSON when the file, schema and model are unchanged since it was written. */
  resume?: boolean;
  deskew?: boolean;
  orientation?: boolean;
  today?: Date;
  /** Called after each document; carries no field values. */
  onDocument?: (event: DocumentEvent) => void;
}

export interface DocumentEvent {
  index: number;
  total: number;
  file: string;
  line: ResultsLine;
  reused: boolean;
}

export interface BatchReport {
  summary: BatchSummary;
  lines: ResultsLine[];
  results: DocumentResult[];
}

async function reusable(jsonFile: string, file: string, options: BatchOptions): Promise<DocumentResult | null> {
  try {
    const previous = DocumentResultSchema.parse(JSON.parse(await readFile(jsonFile, 'utf8')));
    const sha = createHash('sha256').update(await readFile(file)).digest('hex');
    const same =
      previous.document.sha256 === sha &&
      options.schemas.some((s) => s.sha256 === previous.schema.sha256) &&
      previous.model.sha256 === options.detector.sha256;
    return same ? previous : null;
  } catch {
    return null;
  }
}

/**
 * Extract every input document into outDir: one JSON per document, results.jsonl and summary.json (rewritten after
 * each document, so an interrupted run leaves a consistent record), review crops and the review queue. A document that
 * fails is recorded with its error and the batch goes on; a configuration error stops it.
 */
export async function runBatch(options: BatchOptions): Promise<BatchReport> {
  const files = await discoverInputs(options.inputs);
  const ids = documentIds(files);
  await mkdir(options.outDir, { recursive: true });
  const lines: ResultsLine[] = [];
  const results: DocumentResult[] = [];
  let summary = await writeBatchOutputs(options.outDir, lines);

  for (const [index, file] of files.entries()) {
    const id = ids.get(file) as string;
    const jsonFile = path.join(options.outDir, documentJsonName(id));
    let line: ResultsLine;
    let reused = false;
    const previous = options.resume ? await reusable(jsonFile, file, options) : null;
    if (previous) {
      results.push(previous);
      line = okLine(previous);
      reused = true;
    } else {
      try {
        const { result, pages } = await extractDocument(file, {
          schema: options.schemas,
          detector: options.detector,
          documentId: id,
          deskew: options.deskew,
          orientation: options.orientation,
          today: options.today,
        });
        await writeJsonAtomic(jsonFile, result);
        await writeReviewCrops(options.outDir, result, pages);
        results.push(result);
        line = okLine(result);
      } catch (err) {
        if (err instanceof FormgleanError && err.exitCode === 2) throw err;
        const message = err instanceof FormgleanError ? oneLine(err) : `${file}: ${oneLine(err)}`;
        line = failedLine(id, file, message);
      }
    }
    lines.push(line);
    summary = await writeBatchOutputs(options.outDir, lines);
    options.onDocument?.({ index, total: files.length, file, line, reused });
  }
  await writeReviewQueue(options.outDir, results);
  return { summary, lines, results };
}
