import type { StageTimes } from './stage-times.js';

/** What one `extract` run did and where its time went: summary.json's `run` section (the last run's). */
export interface RunRecord {
  startedAt: string;
  /** Wall-clock seconds from the first input started to the index written. */
  wallSeconds: number;
  /** Inputs read at once (worker threads, or 1 in the main thread). */
  workers: number;
  inputs: {
    total: number;
    /** Read this run (failed ones included). */
    read: number;
    /** Unchanged since an earlier run and kept (--resume). */
    kept: number;
    /** Not started because the run was interrupted. */
    notReached: number;
  };
  /** Pages read this run (kept documents not counted). */
  pages: number;
  pagesPerSecond: number | null;
  interrupted: boolean;
  /** The process's peak resident memory in MB (worker threads included), when the index was written. */
  peakRssMb: number;
  /**
   * CPU seconds the process used (every thread, startup included): on a shared machine wall time depends on the
   * neighbours, CPU time much less.
   */
  cpuSeconds: number;
  /** Milliseconds per stage summed over every document read, and per page read; `ocr` is tesseract's part of `read`. */
  stages: Record<keyof StageTimes, { ms: number; msPerPage: number | null }>;
}

export function runRecord(r: Omit<RunRecord, 'stages' | 'pagesPerSecond'>, stages: StageTimes): RunRecord {
  const per = (ms: number) => (r.pages > 0 ? Math.round((ms / r.pages) * 10) / 10 : null);
  const table = Object.fromEntries(Object.entries(stages).map(([k, ms]) => [k, { ms: Math.round(ms), msPerPage: per(ms) }]));
  return {
    ...r,
    wallSeconds: Math.round(r.wallSeconds * 1000) / 1000,
    pagesPerSecond: r.wallSeconds > 0 && r.pages > 0 ? Math.round((r.pages / r.wallSeconds) * 1000) / 1000 : null,
    stages: table as RunRecord['stages'],
  };
}
