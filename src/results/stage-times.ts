import { performance } from 'node:perf_hooks';
import { z } from 'zod';

/**
 * The stages a document goes through, in order, as the pipeline really has them: decode (file to gray page, with the
 * page gate), normalize (orientation and deskew), detect (the ONNX detector), align (layout choice, upright check and
 * registration to the blank), locate (fields to boxes, local touch-up, dropout), read (crops, cleanup, OCR, marks,
 * digit cells), score (confidence and status), write (record and review crops). `ocr` is the part of `read` that
 * tesseract itself was busy: what a run would cost if nothing but OCR were done.
 */
export const STAGES = ['decode', 'normalize', 'detect', 'align', 'locate', 'read', 'score', 'write'] as const;
export const Stage = z.enum(STAGES);
export type Stage = z.infer<typeof Stage>;

/** Milliseconds per stage (and OCR alone), summed over the pages or documents they describe. */
export const StageTimes = z.object({
  decode: z.number(),
  normalize: z.number(),
  detect: z.number(),
  align: z.number(),
  locate: z.number(),
  read: z.number(),
  score: z.number(),
  write: z.number(),
  ocr: z.number(),
});
export type StageTimes = z.infer<typeof StageTimes>;

export function emptyStageTimes(): StageTimes {
  return { decode: 0, normalize: 0, detect: 0, align: 0, locate: 0, read: 0, score: 0, write: 0, ocr: 0 };
}

/** a += b, stage by stage. */
export function addStageTimes(a: StageTimes, b: StageTimes): StageTimes {
  for (const k of Object.keys(a) as (keyof StageTimes)[]) a[k] += b[k];
  return a;
}

/** A stopwatch per stage: what one form (or one input) spent where. */
export class StageClock {
  readonly ms: StageTimes = emptyStageTimes();

  async time<T>(stage: Stage, work: () => T | Promise<T>): Promise<T> {
    const started = performance.now();
    try {
      return await work();
    } finally {
      this.ms[stage] += performance.now() - started;
    }
  }

  timeSync<T>(stage: Stage, work: () => T): T {
    const started = performance.now();
    try {
      return work();
    } finally {
      this.ms[stage] += performance.now() - started;
    }
  }
}
