import type { OcrEngine } from '../read/ocr-engine.js';

/** Busy milliseconds already charged to finished inputs, per engine (each thread owns one engine). */
const charged = new WeakMap<OcrEngine, number>();

/**
 * Milliseconds the engine was busy since the last input charged to it finished. With several inputs in flight in one
 * thread (src/batch/inputs-per-thread.ts) each form's own before/after difference also counts its neighbour's OCR;
 * charging each finished input the engine's time not yet charged keeps the run's sum equal to the engine's busy time.
 */
export function unchargedOcrMs(engine: OcrEngine): number {
  const busy = engine.busyMs;
  const before = charged.get(engine) ?? 0;
  // An engine whose worker was restarted may count again from zero.
  const ms = busy >= before ? busy - before : busy;
  charged.set(engine, busy);
  return ms;
}
