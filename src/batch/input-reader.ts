import type { ClaimId, InputJob, InputOutcome, ReadingSetup } from './read-input.js';
import { readInput } from './read-input.js';

/** Who reads a batch's inputs: this thread, one at a time, or a pool of worker threads (src/batch/worker-pool.ts). */
export interface InputReader {
  /** How many inputs it reads at once: the batch keeps no more than this in flight, so memory stays flat. */
  readonly concurrency: number;
  /** Lines and stage times; `results` may be empty (a pool keeps the records on disk, where the batch reads them). */
  read(job: InputJob, claim: ClaimId): Promise<InputOutcome>;
  close(): Promise<void>;
}

/**
 * Inputs read in this thread with the caller's detector, digit reader and OCR worker, `inputsAtOnce` at a time (two by
 * default, so one's geometry runs while the other waits on OCR: src/batch/inputs-per-thread.ts).
 */
export function inThreadReader(setup: ReadingSetup, inputsAtOnce: number): InputReader {
  return {
    concurrency: inputsAtOnce,
    read: (job, claim) => readInput(job, setup, claim),
    close: async () => undefined,
  };
}
