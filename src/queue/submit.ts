import { createHash } from 'node:crypto';
import path from 'node:path';
import type { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import { discoverInputs, documentIds } from '../batch/discover.js';
import { checkBeforeWriting, previousStem, sha256Of } from '../batch/run-batch.js';
import { writeInputOutcome } from '../results/input-outcome.js';
import { readIndex, warnOnStderr, type Warn } from '../results/index-read.js';
import { writeIndex } from '../results/index-write.js';
import { recordedPath } from '../results/recorded-path.js';
import { skippedLine } from '../results/results-line.js';
import type { LoadedSchema } from '../schema/load.js';
import { KEY_PREFIX } from './names.js';
import type { HashedFile, JobPayload } from './payload.js';
import { claimsKey, seedClaims } from './redis-claims.js';

export interface SubmitOptions {
  inputs: readonly string[];
  schemas: readonly LoadedSchema[];
  model: HashedFile;
  digitModel: HashedFile | null;
  outDir: string;
  deskew: boolean;
  orientation: boolean;
  dropout: boolean;
  /** Tries per job before it is set aside (BullMQ `attempts`). */
  attempts: number;
  warn?: Warn;
}

export interface SubmitReport {
  queued: number;
  /** Inputs whose job (same file, schemas, model, options, folder) is already in the queue: not queued twice. */
  alreadyQueued: number;
  skipped: { path: string; reason: string }[];
}

/**
 * The job id names what is read and where it goes, so submitting the same input twice (a submit run again after an
 * interruption) finds its job instead of queueing a second one: BullMQ adds nothing for an id it already holds.
 */
function jobId(p: Omit<JobPayload, 'earlierJson' | 'stem'>): string {
  const what = JSON.stringify([p.outDir, p.recorded, p.input.sha256, p.schemas.map((s) => s.sha256), p.model.sha256, p.digitModel?.sha256, p.deskew, p.orientation, p.dropout]);
  return `in-${createHash('sha256').update(what).digest('hex').slice(0, 32)}`;
}

/**
 * Queue one job per input file. Everything a local batch decides before reading is decided here, once: the inputs
 * (with the reason for each one skipped), each input's record id (kept from the folder's index when it was read
 * before), the ids other inputs already hold in the folder (claimed in Redis for them), the records whose reviewed
 * answers carry over. Workers then only read.
 */
export async function submitBatch(queue: Queue, redis: Redis, queueName: string, options: SubmitOptions): Promise<SubmitReport> {
  const outDir = path.resolve(options.outDir);
  const { files, skipped } = await discoverInputs(options.inputs, { exclude: [outDir] });
  await checkBeforeWriting({ schemas: options.schemas, outDir });
  const index = await readIndex(outDir, options.warn ?? warnOnStderr);
  // A fresh folder gets its (empty) index now, and one a run cut off left behind its journal is folded in: collect
  // then merges into an index it can trust instead of rebuilding one from the records.
  if (index.missing || index.needsWrite) await writeIndex(outDir, index.lines);
  const previous = index.lines.filter((l) => l.skipped === undefined);
  const inRun = new Set(files.flatMap((f) => [recordedPath(f), f]));
  const key = claimsKey(KEY_PREFIX, queueName, outDir);
  // A folder with nothing in it starts with no claims: ids held for a deleted folder of the same path are let go.
  if (index.empty) await redis.del(key);
  await seedClaims(redis, key, previous.filter((l) => !inRun.has(l.path)));
  const stems = documentIds(files);
  const schemas = options.schemas.map((s) => ({ path: s.path, sha256: s.sha256 }));

  const jobs: { name: string; data: JobPayload; opts: { jobId: string } }[] = [];
  for (const file of files) {
    const recorded = recordedPath(file);
    const own = previous.filter((l) => l.path === recorded || l.path === file);
    const base = {
      v: 1 as const,
      outDir,
      input: { path: file, sha256: await sha256Of(file) },
      recorded,
      schemas,
      model: options.model,
      digitModel: options.digitModel,
      deskew: options.deskew,
      orientation: options.orientation,
      dropout: options.dropout,
      claimsKey: key,
    };
    const data: JobPayload = {
      ...base,
      stem: previousStem(own) ?? (stems.get(file) as string),
      earlierJson: own.filter((l) => l.ok && l.json).map((l) => l.json as string),
    };
    jobs.push({ name: 'read-input', data, opts: { jobId: jobId(base) } });
  }

  let alreadyQueued = 0;
  const fresh: typeof jobs = [];
  for (const job of jobs) {
    const state = await queue.getJobState(job.opts.jobId);
    if (state === 'unknown') fresh.push(job);
    else alreadyQueued++;
  }
  // Skipped inputs are listed in the folder like the local batch lists them, through the same outcome files.
  for (const s of skipped) await writeInputOutcome(outDir, { path: recordedPath(s.path), lines: [skippedLine(recordedPath(s.path), s.reason)] });
  const jobOptions = {
    attempts: options.attempts,
    // 5 s, 10 s, 20 s, ...: a worker that lost its shared folder or its Redis for a moment gets time to recover.
    backoff: { type: 'exponential', delay: 5000 },
    // Finished jobs stay a week (the newest 100 000 at most) for `queue status` and so that submitting the same inputs
    // again finds them; they hold paths and hashes only. Set-aside jobs stay until retried.
    removeOnComplete: { age: 7 * 24 * 3600, count: 100_000 },
    removeOnFail: false,
  };
  // addBulk is one MULTI per chunk; 500 keeps each under a few hundred kilobytes (common practice for pipelines).
  for (let i = 0; i < fresh.length; i += 500) {
    await queue.addBulk(fresh.slice(i, i + 500).map((j) => ({ ...j, opts: { ...jobOptions, ...j.opts } })));
  }
  return { queued: fresh.length, alreadyQueued, skipped: skipped.map((s) => ({ path: recordedPath(s.path), reason: s.reason })) };
}
