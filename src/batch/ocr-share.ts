import { sharedOcrEngine } from '../read/ocr-engine.js';

let charged = 0;

/**
 * Milliseconds tesseract was busy since the last input this thread finished. With several inputs in flight in one
 * thread (src/batch/inputs-per-thread.ts) each form's own before/after difference also counts its neighbour's OCR;
 * charging each finished input the engine's time not yet charged keeps the run's sum equal to the engine's busy time.
 */
export function unchargedOcrMs(): number {
  const busy = sharedOcrEngine().busyMs;
  // A closed and reopened engine starts again from zero.
  const ms = busy >= charged ? busy - charged : busy;
  charged = busy;
  return ms;
}
