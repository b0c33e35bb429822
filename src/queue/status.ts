import type { Job, JobType, Queue } from 'bullmq';
import { JobOutcome, JobPayload } from './payload.js';

export interface SetAside {
  input: string;
  attempts: number;
  /** The job's last error, one line (masked by the caller before it is printed). */
  error: string;
}

export interface QueueStatus {
  waiting: number;
  active: number;
  /** Waiting out a backoff before another try. */
  delayed: number;
  done: number;
  /** Out of tries: kept with their error until `queue retry`. */
  setAside: number;
  /** Pages read per second by the whole fleet over the most recent finished jobs; null before two finish. */
  pagesPerSecond: number | null;
  /** Finished jobs the rate was measured on. */
  rateJobs: number;
  setAsideJobs: SetAside[];
}

/** The rate is taken over the newest finished jobs only, so status stays quick on a queue of a million. */
const RATE_WINDOW = 1000;

function recordedOf(job: Job): string {
  const p = JobPayload.safeParse(job.data);
  return p.success ? p.data.recorded : String(job.id);
}

/** Pages over the span from the first of these jobs starting to the last finishing: what the fleet delivered. */
export function pagesPerSecond(jobs: readonly Job[]): number | null {
  let pages = 0;
  let first = Infinity;
  let last = -Infinity;
  let n = 0;
  for (const j of jobs) {
    const r = JobOutcome.safeParse(j.returnvalue);
    if (!r.success || j.processedOn === undefined || j.finishedOn === undefined) continue;
    pages += r.data.pages;
    first = Math.min(first, j.processedOn);
    last = Math.max(last, j.finishedOn);
    n++;
  }
  if (n < 2 || last <= first) return null;
  return pages / ((last - first) / 1000);
}

export async function queueStatus(queue: Queue, listSetAside: number): Promise<QueueStatus> {
  // 'paused': the waiting jobs of a paused queue (a list of their own; BullMQ's counter knows it, its types do not).
  const c = await queue.getJobCounts('waiting', 'paused' as JobType, 'active', 'delayed', 'prioritized', 'completed', 'failed');
  const recent = (await queue.getJobs(['completed'], 0, RATE_WINDOW - 1)) as Job[];
  const failed = listSetAside > 0 ? ((await queue.getJobs(['failed'], 0, listSetAside - 1)) as Job[]) : [];
  return {
    waiting: (c.waiting ?? 0) + (c.paused ?? 0) + (c.prioritized ?? 0),
    active: c.active ?? 0,
    delayed: c.delayed ?? 0,
    done: c.completed ?? 0,
    setAside: c.failed ?? 0,
    pagesPerSecond: pagesPerSecond(recent),
    rateJobs: recent.length,
    setAsideJobs: failed.map((j) => ({ input: recordedOf(j), attempts: j.attemptsMade, error: (j.failedReason ?? '').split(/\r?\n/)[0] })),
  };
}

/**
 * Put set-aside jobs back in the queue with a fresh count of tries: all of them, or those whose input's recorded path
 * is named. Returns the inputs put back.
 */
export async function retrySetAside(queue: Queue, only: ReadonlySet<string> | null): Promise<string[]> {
  const back: string[] = [];
  // Pages of 500 from the start: each retried job leaves the failed set, so the next page starts at 0 again.
  for (let skipped = 0; ; ) {
    const page = (await queue.getJobs(['failed'], skipped, skipped + 499, true)) as Job[];
    if (page.length === 0) break;
    for (const job of page) {
      const input = recordedOf(job);
      if (only !== null && !only.has(input)) {
        skipped++;
        continue;
      }
      await job.retry('failed', { resetAttemptsMade: true, resetAttemptsStarted: true });
      back.push(input);
    }
  }
  return back;
}
