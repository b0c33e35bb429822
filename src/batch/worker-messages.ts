import type { SchemaFile } from '../schema/load.js';
import type { ResultsLine } from '../results/results-line.js';
import type { StageTimes } from '../results/stage-times.js';

/** What a worker thread needs to open its own reading setup (structured-cloned into the thread once). */
export interface WorkerSpec {
  /** Plain data: the worker resolves the fields and decodes the blanks itself. */
  schemas: SchemaFile[];
  modelPath: string;
  /** onnxruntime intra-op threads of the worker's detector session. */
  intraOpThreads: number;
  /** Absent: digit combs read with Tesseract alone. */
  digitModelPath?: string;
  outDir: string;
  deskew?: boolean;
  orientation?: boolean;
  dropout?: boolean;
  today?: Date;
}

/** A worker asks the main thread for a document id ... */
export interface ClaimRequest {
  id: number;
  requested: string;
}

/** ... and gets the one the folder gives it. */
export interface ClaimAnswer {
  id: number;
  granted: string;
}

/** What comes back from a worker: the index lines and stage times; the records are already on disk. */
export interface WorkerOutcome {
  lines: ResultsLine[];
  stages?: StageTimes;
  /** An error that stops the batch (exit code 2) or a failure outside readInput's own handling. */
  failure?: { message: string; exitCode: 1 | 2 };
}
