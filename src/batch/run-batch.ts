import { createHash } from 'node:crypto';
import { mkdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Detector } from '../detect/types.js';
import { FormgleanError, oneLine } from '../errors.js';
import { writeJsonAtomic } from '../io/atomic-write.js';
import { extractFile } from '../pipeline/extract-document.js';
import type { DigitReader } from '../read/digit-reader.js';
import type { DocumentResult } from '../result/document.js';
import { DocumentResult as DocumentResultSchema } from '../result/document.js';
import { writeReviewCrops } from '../review/crops.js';
import { writeReviewQueue } from '../review/queue-write.js';
import type { LoadedSchema } from '../schema/load.js';
import { discoverInputs, documentIds } from './discover.js';
import type { BatchSummary, ResultsLine } from './sinks.js';
import { documentJsonName, failedLine, okLine, readResultsLines, writeBatchOutputs } from './sinks.js';

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
  /** Read text from the page with the printed form subtracted (see ExtractOptions.dropout). */
  dropout?: boolean;
  /** Digit reader for digit combs (see ExtractOptions.digitReader). */
  digitReader?: DigitReader;
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

/**
 * The records a previous run wrote for this file, when the file, the schemas and the model are unchanged: a file
 * that held a stack of forms has several (id, id.p2, ...), listed by the previous results.jsonl.
 */
async function reusable(
  outDir: string,
  previousLines: readonly ResultsLine[],
  id: string,
  file: string,
  options: BatchOptions,
): Promise<DocumentResult[] | null> {
  try {
    const own = previousLines.filter((l) => l.path === file && l.ok && l.json);
    if (own.length === 0) return null;
    const sha = createHash('sha256').update(await readFile(file)).digest('hex');
    const records: DocumentResult[] = [];
    for (const l of own) {
      const previous = DocumentResultSchema.parse(JSON.parse(await readFile(path.join(outDir, l.json as string), 'utf8')));
      const same =
        previous.document.sha256 === sha &&
        (previous.document.id === id || previous.document.id.startsWith(`${id}.p`)) &&
        options.schemas.some((s) => s.sha256 === previous.schema.sha256) &&
        previous.model.sha256 === options.detector.sha256;
      if (!same) return null;
      records.push(previous);
    }
    return records;
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
  // Read before anything is rewritten: --resume trusts only records that the previous run listed.
  const previousLines = options.resume ? await readResultsLines(options.outDir).catch(() => []) : [];
  const lines: ResultsLine[] = [];
  const results: DocumentResult[] = [];
  let summary = await writeBatchOutputs(options.outDir, lines);

  for (const [index, file] of files.entries()) {
    const id = ids.get(file) as string;
    const reused = options.resume ? await reusable(options.outDir, previousLines, id, file, options) : null;
    const fileLines: ResultsLine[] = [];
    if (reused) {
      results.push(...reused);
      fileLines.push(...reused.map(okLine));
    } else {
      try {
        const forms = await extractFile(file, {
          schema: options.schemas,
          detector: options.detector,
          documentId: id,
          deskew: options.deskew,
          orientation: options.orientation,
          dropout: options.dropout,
          digitReader: options.digitReader,
          today: options.today,
        });
        for (const { result, pages } of forms) {
          await writeJsonAtomic(path.join(options.outDir, documentJsonName(result.document.id)), result);
          await writeReviewCrops(options.outDir, result, pages);
          results.push(result);
          fileLines.push(okLine(result));
        }
      } catch (err) {
        if (err instanceof FormgleanError && err.exitCode === 2) throw err;
        const message = err instanceof FormgleanError ? oneLine(err) : `${file}: ${oneLine(err)}`;
        fileLines.push(failedLine(id, file, message));
      }
    }
    lines.push(...fileLines);
    summary = await writeBatchOutputs(options.outDir, lines);
    for (const line of fileLines) options.onDocument?.({ index, total: files.length, file, line, reused: reused !== null });
  }
  await writeReviewQueue(options.outDir, results);
  return { summary, lines, results };
}
