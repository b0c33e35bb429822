import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { Detector } from '../detect/types.js';
import { FormgleanError, oneLine } from '../errors.js';
import { writeJsonAtomic } from '../io/atomic-write.js';
import { extractForms, type ExtractOptions } from '../pipeline/extract-document.js';
import type { DocumentResult } from '../result/document.js';
import { readResultsRecord } from '../results/document-record.js';
import { documentJsonName } from '../results/layout.js';
import { addStageTimes, emptyStageTimes, type StageTimes } from '../results/stage-times.js';
import { failedLine, okLine, withRequestedId, type ResultsLine } from '../results/results-line.js';
import { writeReviewCrops } from '../review/crops.js';
import type { LoadedSchema } from '../schema/load.js';
import { carryReviewedFields } from './carry-review.js';
import { rereadAs } from '../review/layout-question.js';
import { unchargedOcrMs } from './ocr-share.js';

/** What reading any input needs: the same for every input of a run, and for every worker that serves it. */
export interface ReadingSetup extends Omit<ExtractOptions, 'schema' | 'documentId' | 'recordedAs' | 'limits'> {
  schemas: readonly LoadedSchema[];
  detector: Detector;
  /** The results folder the records and review crops are written to. */
  outDir: string;
}

/** One input file to read: the unit of work of a batch, whoever runs it (this process, a worker thread, a queue worker). */
export interface InputJob {
  file: string;
  /** The path as the results folder records it (see results/recorded-path). */
  recorded: string;
  /** Id of the file's record; a stack of forms gets stem.p1, stem.p2, ... */
  stem: string;
  /** Record files (relative to the results folder) an earlier run wrote for this file: reviewed answers carry over. */
  earlierJson: readonly string[];
}

/**
 * Turns the id a form asks for into the one it gets in the results folder (two inputs must not write one record).
 * The batch owns the claims; a worker asks for them, so the answer may come back later.
 */
export type ClaimId = (requested: string) => string | Promise<string>;

export interface InputOutcome {
  lines: ResultsLine[];
  results: DocumentResult[];
  /** Milliseconds the input's forms spent in each stage, writing included (a failed input: what it got through). */
  stages?: StageTimes;
}

/** Same scan, an offered schema and the same model: what a record needs to be reused or to hand its answers on. */
export function sameInputs(record: DocumentResult, sha: string, setup: Pick<ReadingSetup, 'schemas' | 'detector'>): boolean {
  return (
    record.document.sha256 === sha &&
    setup.schemas.some((s) => s.sha256 === record.schema.sha256) &&
    record.model.sha256 === setup.detector.sha256
  );
}

async function earlierRecords(outDir: string, jsonNames: readonly string[]): Promise<Map<string, DocumentResult>> {
  const out = new Map<string, DocumentResult>();
  for (const name of jsonNames) {
    const r = await readResultsRecord(path.join(outDir, name)).catch(() => null);
    if (r) out.set(r.document.id, r);
  }
  return out;
}

/**
 * Read one input file into the results folder: every form it holds is written (record and review crops) as soon as
 * it is read, and its pages let go. A document that cannot be read becomes a failed line; a configuration error
 * (exit code 2) stops the caller's batch instead.
 */
export async function readInput(job: InputJob, setup: ReadingSetup, claim: ClaimId): Promise<InputOutcome> {
  const lines: ResultsLine[] = [];
  const results: DocumentResult[] = [];
  const stages = emptyStageTimes();
  try {
    const { schemas, outDir, ...extract } = setup;
    const earlier = await earlierRecords(outDir, job.earlierJson);
    // A person said this scan is another of the run's forms: it is read with that form's schema alone.
    const named = rereadAs([...earlier.values()], schemas);
    const forms = extractForms(job.file, {
      ...extract,
      schema: named ? [named.schema] : schemas,
      ...(named ? { layoutFromReview: named.review } : {}),
      documentId: job.stem,
      recordedAs: job.recorded,
    });
    for await (const { result: read, pages, stages: formStages } of forms) {
      addStageTimes(stages, formStages);
      const requested = read.document.id;
      read.document.id = await claim(requested);
      const before = earlier.get(read.document.id);
      const result = before && sameInputs(before, read.document.sha256, setup) ? carryReviewedFields(read, before) : read;
      const written = performance.now();
      await writeJsonAtomic(path.join(outDir, documentJsonName(result.document.id)), result);
      await writeReviewCrops(outDir, result, pages);
      stages.write += performance.now() - written;
      results.push(result);
      lines.push(withRequestedId(okLine(result), requested));
    }
  } catch (err) {
    if (err instanceof FormgleanError && err.exitCode === 2) throw err;
    const message = err instanceof FormgleanError ? oneLine(err) : `${job.file}: ${oneLine(err)}`;
    lines.push(failedLine(await claim(job.stem), job.recorded, message));
  }
  // Other inputs of this thread may have been in OCR meanwhile: charge what the engine has not charged yet.
  stages.ocr = unchargedOcrMs(setup.ocr);
  return { lines, results, stages };
}
