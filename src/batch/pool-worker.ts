/**
 * The entry of one batch worker thread (src/batch/worker-pool.ts): it opens its own detector session, digit reader and
 * OCR worker on its first input and keeps them for its life, reads each input it is given with readInput (the same
 * unit of work as in the main thread), and asks the main thread for every document id it claims.
 */
import type { MessagePort } from 'node:worker_threads';
import Tinypool from 'tinypool';
import { loadDetector } from '../detect/onnx-detector.js';
import { FormgleanError, oneLine } from '../errors.js';
import { DigitReader } from '../read/digit-reader.js';
import { OcrEngine } from '../read/ocr-engine.js';
import { ReferencePages } from '../pipeline/reference-pages.js';
import { resolveSchema } from '../schema/load.js';
import { readInput, type InputJob, type ReadingSetup } from './read-input.js';
import type { ClaimAnswer, ClaimRequest, WorkerOutcome, WorkerSpec } from './worker-messages.js';

let opened: Promise<ReadingSetup> | null = null;

async function open(spec: WorkerSpec): Promise<ReadingSetup> {
  const detector = await loadDetector(spec.modelPath, { intraOpThreads: spec.intraOpThreads });
  const digitReader = spec.digitModelPath ? await DigitReader.open(spec.digitModelPath) : undefined;
  return {
    schemas: spec.schemas.map(resolveSchema),
    references: await ReferencePages.decode(spec.schemas),
    ocr: new OcrEngine(),
    detector,
    digitReader,
    outDir: spec.outDir,
    deskew: spec.deskew,
    orientation: spec.orientation,
    dropout: spec.dropout,
    today: spec.today,
  };
}

/** A claim answered by the main thread, which alone holds the folder's ids. */
function claimThrough(port: MessagePort): (requested: string) => Promise<string> {
  let next = 0;
  const waiting = new Map<number, (granted: string) => void>();
  port.on('message', (answer: ClaimAnswer) => {
    waiting.get(answer.id)?.(answer.granted);
    waiting.delete(answer.id);
  });
  return (requested) =>
    new Promise((resolve) => {
      const id = next++;
      waiting.set(id, resolve);
      port.postMessage({ id, requested } satisfies ClaimRequest);
    });
}

export default async function readInputInWorker(task: { job: InputJob; port: MessagePort }): Promise<WorkerOutcome> {
  try {
    const setup = await (opened ??= open(Tinypool.workerData as WorkerSpec));
    const outcome = await readInput(task.job, setup, claimThrough(task.port));
    // The records are on disk; only the small index lines travel back.
    return { lines: outcome.lines, stages: outcome.stages };
  } catch (err) {
    // Errors lose their class between threads: a configuration error travels as its line and exit code.
    if (err instanceof FormgleanError) return { lines: [], failure: { message: err.message, exitCode: err.exitCode } };
    return { lines: [], failure: { message: `${task.job.file}: ${oneLine(err)}`, exitCode: 1 } };
  } finally {
    task.port.close();
  }
}

/** Called by the pool before the thread ends: the detector session, digit reader and OCR worker are let go. */
export async function closeWorker(): Promise<void> {
  const setup = await opened?.catch(() => null);
  opened = null;
  await setup?.detector.close();
  await setup?.digitReader?.close();
  await setup?.ocr.close();
}
