/**
 * Pages per second through the Redis job queue with one worker process and with two, and the queue's own overhead
 * per document, against a redis-server this script starts on a free loopback port (persistence off) and stops.
 *
 *   npx tsx bench/queue-throughput.ts [--inputs 6] [--sample samples/marina-slip-typed.jpg]
 *       [--schema schemas/marina-slip.yaml] [--workers 1,2] [--overhead-jobs 200]
 *
 * Throughput: N copies of one demo scan (separate inputs) submitted with `queue submit`, read by W `queue work
 * --until-empty` processes started together; pages/s is counted from the first job starting to the last finishing
 * (what `queue status` shows), and again on the wall clock from the workers' start (model loading included).
 * Overhead: jobs whose processor does everything a real one does except reading (payload check, id claim in Redis,
 * the outcome file written atomically), so the time per job is what the queue adds to each document.
 * Needs redis-server (Debian: apt-get install redis-server). Numbers are machine- and load-dependent: run it on a
 * quiet machine and say how busy it was.
 */
import { copyFile, mkdir, mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { Queue, Worker, type Job } from 'bullmq';
import { Redis } from 'ioredis';
import { KEY_PREFIX } from '../src/queue/names.js';
import { JobOutcome, JobPayload } from '../src/queue/payload.js';
import { claimId, claimsKey } from '../src/queue/redis-claims.js';
import { pagesPerSecond } from '../src/queue/status.js';
import { writeInputOutcome } from '../src/results/input-outcome.js';
import { documentJsonName } from '../src/results/layout.js';
import { REPO, runCli, startCli } from '../test/cli/run-cli.js';
import { missingRedisServer, startRedis, type TestRedis } from '../test/queue/redis-server.js';

const { values: args } = parseArgs({
  options: {
    inputs: { type: 'string', default: '6' },
    sample: { type: 'string', default: path.join(REPO, 'samples/marina-slip-typed.jpg') },
    schema: { type: 'string', default: path.join(REPO, 'schemas/marina-slip.yaml') },
    workers: { type: 'string', default: '1,2' },
    'overhead-jobs': { type: 'string', default: '200' },
  },
});

async function throughput(redis: TestRedis, work: string, workers: number, n: number): Promise<void> {
  const name = `bench-${workers}`;
  const scans = path.join(work, name, 'scans');
  await mkdir(scans, { recursive: true });
  for (let i = 0; i < n; i++) await copyFile(args.sample, path.join(scans, `scan-${i}${path.extname(args.sample)}`));
  const env = { FORMGLEAN_REDIS_URL: redis.url };
  const submit = await runCli(['queue', 'submit', scans, '--schema', args.schema, '--out', path.join(work, name, 'out'), '--queue', name], { env });
  if (submit.code !== 0) throw new Error(submit.stderr);
  const started = performance.now();
  const procs = Array.from({ length: workers }, () => startCli(['queue', 'work', '--until-empty', '--queue', name], { env }));
  const done = await Promise.all(procs.map((p) => p.done));
  const wall = (performance.now() - started) / 1000;
  if (done.some((d) => d.code !== 0)) throw new Error(done.map((d) => d.stderr).join('\n'));
  const queue = new Queue(name, { connection: { url: redis.url }, prefix: KEY_PREFIX });
  const jobs = (await queue.getJobs(['completed'])) as Job[];
  await queue.close();
  const pages = jobs.reduce((a, j) => a + JobOutcome.parse(j.returnvalue).pages, 0);
  const perJob = jobs.map((j) => ((j.finishedOn ?? 0) - (j.processedOn ?? 0)) / 1000);
  const rate = pagesPerSecond(jobs);
  console.log(
    `${workers} worker process(es): ${jobs.length} jobs, ${pages} pages; ${rate?.toFixed(3)} pages/s first start to last finish; ` +
      `${(pages / wall).toFixed(3)} pages/s on the wall clock from the workers' start (${wall.toFixed(1)} s, model loading included); ` +
      `${(perJob.reduce((a, b) => a + b, 0) / perJob.length).toFixed(2)} s per job in a worker`,
  );
}

async function overhead(redis: TestRedis, work: string, n: number): Promise<void> {
  const name = 'bench-overhead';
  const outDir = path.join(work, 'overhead');
  const client = new Redis(redis.url);
  const queue = new Queue(name, { connection: { url: redis.url }, prefix: KEY_PREFIX });
  const key = claimsKey(KEY_PREFIX, name, outDir);
  const hash = { path: args.schema, sha256: '0'.repeat(64) };
  const jobs = Array.from({ length: n }, (_, i) => {
    const data: JobPayload = {
      v: 1, outDir, input: { path: `/shared/scan-${i}.png`, sha256: '1'.repeat(64) }, recorded: `scans/scan-${i}.png`, stem: `scan-${i}`,
      earlierJson: [], schemas: [hash], model: hash, digitModel: null, deskew: true, orientation: true, dropout: false, claimsKey: key,
    };
    return { name: 'read-input', data, opts: { jobId: `in-${i}`, attempts: 3, removeOnComplete: false, removeOnFail: false } };
  });
  const t0 = performance.now();
  await queue.addBulk(jobs);
  const submitMs = performance.now() - t0;
  let finished = 0;
  const t1 = performance.now();
  await new Promise<void>((resolve) => {
    const worker = new Worker(
      name,
      async (job: Job) => {
        const p = JobPayload.parse(job.data);
        const id = await claimId(client, p.claimsKey, p.stem, p.recorded);
        const line = { document: id, path: p.recorded, ok: true, json: documentJsonName(id), sha256: p.input.sha256, pages: 1 };
        await writeInputOutcome(p.outDir, { path: p.recorded, lines: [line] });
        return { documents: 1, failed: 0, pages: 1, seconds: 0 };
      },
      { connection: { url: redis.url, maxRetriesPerRequest: null }, prefix: KEY_PREFIX, concurrency: 1 },
    );
    worker.on('completed', () => {
      if (++finished === n) void worker.close().then(() => resolve());
    });
  });
  const workMs = performance.now() - t1;
  await queue.close();
  client.disconnect();
  console.log(
    `queue overhead: submit ${(submitMs / n).toFixed(2)} ms per job (addBulk); fetch, lock, id claim, outcome file and ` +
      `completion ${(workMs / n).toFixed(2)} ms per job with one worker (${n} jobs, concurrency 1)`,
  );
}

const missing = missingRedisServer();
if (missing) {
  console.error(missing);
  process.exit(2);
}
const work = await mkdtemp(path.join(os.tmpdir(), 'fg-queue-bench-'));
const redis = await startRedis();
try {
  console.log(`machine: ${os.cpus().length} cores, load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')} at start`);
  await overhead(redis, work, Number(args['overhead-jobs']));
  for (const w of args.workers.split(',').map(Number)) await throughput(redis, work, w, Number(args.inputs));
  console.log(`load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')} at the end`);
} finally {
  await redis.dispose();
  await rm(work, { recursive: true, force: true });
}
