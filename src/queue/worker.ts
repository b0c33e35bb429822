import { Queue, UnrecoverableError, Worker, type Job, type JobType } from 'bullmq';
import type { Redis } from 'ioredis';
import { readInput } from '../batch/read-input.js';
import { sha256Of } from '../batch/run-batch.js';
import { oneLine } from '../errors.js';
import { writeInputOutcome } from '../results/input-outcome.js';
import { failedLine } from '../results/results-line.js';
import { KEY_PREFIX } from './names.js';
import { JobPayload, type JobOutcome } from './payload.js';
import { claimId } from './redis-claims.js';
import { connectionOptions, mask, type RedisTarget } from './redis-url.js';
import type { WorkerResources } from './resources.js';

export interface WorkOptions {
  target: RedisTarget;
  queueName: string;
  /** Jobs this process reads at once. */
  concurrency: number;
  /**
   * How long a job stays with a worker that stopped answering (killed, machine lost) before another worker takes it.
   * The lock is renewed at half this time while the job runs (BullMQ's lockDuration and lockRenewTime).
   */
  lockSeconds: number;
  /** Stop once nothing is waiting, delayed or running (for scripted runs); default: serve until stopped. */
  untilEmpty: boolean;
  /** One line per event: paths, counts and errors, never a field value. */
  log: (line: string) => void;
}

/**
 * A stalled job (its worker died with it) goes back to the queue this many times; one more and it is set aside as
 * failed: a document that kills the worker reading it three times over would otherwise take the batch down with it.
 * Common practice for poison messages; BullMQ's default is 1.
 */
const MAX_STALLS = 2;

/**
 * Job states that still have work to do. A paused queue keeps its waiting jobs in a list of its own, which BullMQ's
 * Lua counter reads as 'paused' though its TypeScript list of job types leaves it out.
 */
const UNFINISHED = ['waiting', 'paused' as JobType, 'active', 'delayed', 'prioritized', 'waiting-children'] as JobType[];

function payloadOf(job: Job): JobPayload {
  const parsed = JobPayload.safeParse(job.data);
  if (!parsed.success) throw new UnrecoverableError(`job ${job.id}: not a job this formglean worker can read (payload version 1 expected)`);
  return parsed.data;
}

/** Read one queued input with the local batch's unit of work; its outcome file replaces any earlier try's whole. */
async function processJob(job: Job, redis: Redis, resources: WorkerResources): Promise<JobOutcome> {
  const p = payloadOf(job);
  const { schemas, detector } = await resources.checked(p.schemas, p.model);
  const digitReader = await resources.digitReader(p.digitModel);
  let sha: string;
  try {
    sha = await sha256Of(p.input.path);
  } catch (err) {
    // Perhaps only this machine misses it (shared folder not mounted here): another try, maybe elsewhere.
    throw new Error(`${p.recorded}: cannot read the input on this worker (${(err as NodeJS.ErrnoException).code ?? oneLine(err)}); is the shared folder mounted at ${p.input.path}?`);
  }
  if (sha !== p.input.sha256) throw new UnrecoverableError(`${p.recorded}: the file changed after it was submitted (sha256 differs); submit it again`);
  const setup = { schemas, references: resources.references, ocr: resources.ocr, detector, digitReader, outDir: p.outDir, deskew: p.deskew, orientation: p.orientation, dropout: p.dropout };
  const input = { file: p.input.path, recorded: p.recorded, stem: p.stem, earlierJson: p.earlierJson };
  const outcome = await readInput(input, setup, (requested) => claimId(redis, p.claimsKey, requested, p.recorded));
  await writeInputOutcome(p.outDir, { path: p.recorded, lines: outcome.lines });
  return {
    documents: outcome.lines.filter((l) => l.ok).length,
    failed: outcome.lines.filter((l) => !l.ok).length,
    pages: outcome.lines.reduce((a, l) => a + (l.pages ?? 0), 0),
    seconds: outcome.lines.reduce((a, l) => a + (l.seconds ?? 0), 0),
  };
}

/**
 * A job out of tries is set aside: it stays in the queue's failed set with its error (for `queue status` and
 * `queue retry`), and its input is listed as failed in the results folder so `queue collect` reports it.
 */
async function setAside(job: Job, redis: Redis, error: string): Promise<void> {
  const parsed = JobPayload.safeParse(job.data);
  if (!parsed.success) return;
  const p = parsed.data;
  const id = await claimId(redis, p.claimsKey, p.stem, p.recorded);
  await writeInputOutcome(p.outDir, { path: p.recorded, lines: [failedLine(id, p.recorded, `set aside after ${job.attemptsMade} attempt(s): ${error}`)] });
}

/** Serve the queue until stopped (SIGINT, SIGTERM: the jobs in hand are finished first) or, with untilEmpty, drained. */
export async function runWorker(options: WorkOptions, redis: Redis, resources: WorkerResources): Promise<{ completed: number; failed: number }> {
  const { target, log } = options;
  let completed = 0;
  let failed = 0;
  // Set-aside records still being written: the worker does not return before they are on disk.
  const pending = new Set<Promise<void>>();
  const worker = new Worker(options.queueName, (job: Job) => processJob(job, redis, resources), {
    connection: connectionOptions(target, 'worker'),
    prefix: KEY_PREFIX,
    concurrency: options.concurrency,
    lockDuration: options.lockSeconds * 1000,
    stalledInterval: options.lockSeconds * 1000,
    maxStalledCount: MAX_STALLS,
    // Long-poll 2 s for new jobs, so an --until-empty worker notices a drained queue soon (BullMQ's default is 5 s).
    drainDelay: 2,
  });
  worker.on('completed', (job: Job, r: JobOutcome) => {
    completed++;
    const p = JobPayload.safeParse(job.data);
    log(`${p.success ? p.data.recorded : job.id}: ${r.documents} form(s) read, ${r.failed} failed, ${r.pages} page(s) in ${r.seconds.toFixed(1)} s`);
  });
  worker.on('failed', (job: Job | undefined, err: Error) => {
    const message = mask(target, oneLine(err));
    if (!job) return log(`a job failed: ${message}`);
    const p = JobPayload.safeParse(job.data);
    const name = p.success ? p.data.recorded : String(job.id);
    const recording = job
      .getState()
      .then(async (state) => {
        if (state !== 'failed') return log(`${name}: attempt ${job.attemptsMade} failed, will be tried again: ${message}`);
        failed++;
        await setAside(job, redis, message);
        log(`${name}: set aside after ${job.attemptsMade} attempt(s): ${message}`);
      })
      .catch((e) => log(`${name}: failed (${message}); could not record it: ${mask(target, oneLine(e))}`))
      .finally(() => pending.delete(recording));
    pending.add(recording);
  });
  // Redis lost for a while: BullMQ reconnects by itself; say so once per outage kind, masked.
  let lastError = '';
  worker.on('error', (err: Error) => {
    const message = mask(target, oneLine(err));
    if (message !== lastError) log(`queue connection: ${message}`);
    lastError = message;
  });
  worker.on('ready', () => {
    if (lastError !== '') log('queue connection: back');
    lastError = '';
  });

  // The claims client sees an outage too (BullMQ's own clients reconnect without an 'error' for a clean close).
  let down = false;
  redis.on('close', () => {
    if (!down) log(`queue connection lost; reconnecting to ${target.masked}`);
    down = true;
  });
  redis.on('ready', () => {
    if (down) log('queue connection: back');
    down = false;
  });

  const stop = async (): Promise<void> => {
    await worker.close();
  };
  const onSignal = (): void => {
    log('stopping: finishing the jobs in hand');
    void stop();
  };
  process.once('SIGINT', onSignal);
  process.once('SIGTERM', onSignal);

  await worker.waitUntilReady();
  log(`serving queue "${options.queueName}" on ${target.masked} with concurrency ${options.concurrency}`);
  if (options.untilEmpty) {
    const queue = new Queue(options.queueName, { connection: connectionOptions(target, 'worker'), prefix: KEY_PREFIX });
    queue.on('error', () => {}); // the worker's handler above reports the outage
    for (;;) {
      await new Promise((r) => setTimeout(r, 1000));
      if (worker.closing) break;
      const counts = await queue
        .getJobCounts(...UNFINISHED)
        .then((c) => Object.values(c))
        .catch(() => [1]);
      if (counts.every((n) => n === 0)) break;
    }
    await queue.close();
    await stop();
  } else {
    await new Promise<void>((resolve) => worker.on('closed', () => resolve()));
  }
  await Promise.all(pending);
  process.off('SIGINT', onSignal);
  process.off('SIGTERM', onSignal);
  return { completed, failed };
}
