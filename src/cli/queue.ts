import path from 'node:path';
import { stat } from 'node:fs/promises';
import type { Command } from 'commander';
import { sha256Of } from '../batch/run-batch.js';
import { loadDetector } from '../detect/onnx-detector.js';
import { configError, printable } from '../errors.js';
import { collectResults } from '../queue/collect.js';
import { checkQueueName, DEFAULT_QUEUE } from '../queue/names.js';
import { parseRedisUrl, mask, REDIS_URL_ENV, type RedisTarget } from '../queue/redis-url.js';
import { WorkerResources } from '../queue/resources.js';
import { queueStatus, retrySetAside } from '../queue/status.js';
import { submitBatch } from '../queue/submit.js';
import { recordedPath } from '../results/recorded-path.js';
import { checkSchemasAgainstDetector, collect, loadSchemasChecked, readingOptions, summaryText } from './extract.js';
import { optionalWholeNumber, wholeNumber } from './whole-number.js';

interface RedisCliOptions {
  redis?: string;
  redisCa?: string;
  queue: string;
}

/** The options every queue command shares: where Redis is, how to trust its TLS certificate, which queue. */
function withRedis(cmd: Command): Command {
  return cmd
    .option('--redis <url>', `Redis URL: redis://[user:password@]host[:port][/db], rediss://... for TLS (default: ${REDIS_URL_ENV}, which keeps a password out of the process list)`)
    .option('--redis-ca <file>', 'PEM certificate authority that signed the Redis server\'s TLS certificate (a private CA)')
    .option('--queue <name>', 'queue name: one per batch or per team', DEFAULT_QUEUE);
}

function target(opts: RedisCliOptions): { target: RedisTarget; name: string } {
  return { target: parseRedisUrl(opts.redis, opts.redisCa), name: checkQueueName(opts.queue) };
}

/** The Redis client libraries load only when a queue command runs, so every other command starts as fast as before. */
const connect = () => import('../queue/connect.js');

/** Log lines of a worker: time, pid and the event (paths and counts, never a field value). */
function logLine(line: string): void {
  process.stderr.write(`${new Date().toISOString()} worker ${process.pid}: ${printable(line)}\n`);
}

/** `formglean queue ...`: the same reading as extract, spread over worker processes on any number of machines. */
export function registerQueueCommand(program: Command): void {
  const queue = program
    .command('queue')
    .description('Read a batch with workers on several machines, through a Redis job queue (BullMQ)')
    .addHelpText(
      'after',
      '\nInputs, schemas, models and the results folder must be at the same paths on every machine (a shared folder).\n' +
        'Jobs hold paths and hashes only, never field values. See the README, "Workers on several machines".\n',
    );

  withRedis(
    readingOptions(
      queue.command('submit').description('Queue one job per input file; read them with `queue work`, then fold the results in with `queue collect`'),
    ).option('--attempts <n>', 'tries per job before it is set aside as failed', '3'),
  ).action(async (inputs: string[], opts: RedisCliOptions & { schema: string[]; model: string; out: string; deskew: boolean; orientation: boolean; dropout?: boolean; digitModel: string; digitReader: boolean; attempts: string }) => {
    const attempts = wholeNumber('--attempts', opts.attempts, 1);
    const { target: t, name } = target(opts);
    const outStat = await stat(opts.out).catch(() => null);
    if (outStat && !outStat.isDirectory()) throw configError(opts.out, 'the --out path exists and is not a folder');
    const schemas = await loadSchemasChecked(opts.schema, 'queue submit');
    // The detector is opened once here to check the schemas against its classes and to take its hash.
    const detector = await loadDetector(opts.model);
    try {
      checkSchemasAgainstDetector(schemas, detector);
    } finally {
      await detector.close();
    }
    const digitModel = opts.digitReader ? { path: path.resolve(opts.digitModel), sha256: await sha256Of(opts.digitModel).catch(() => { throw configError(opts.digitModel, 'digit model file not found or unreadable'); }) } : null;
    await (await connect()).masked(t, async () => {
      const redis = await (await connect()).connectRedis(t, 'command');
      const q = await (await connect()).openQueue(t, name);
      try {
        const r = await submitBatch(q, redis, name, {
          inputs,
          schemas,
          model: { path: detector.path, sha256: detector.sha256 },
          digitModel,
          outDir: opts.out,
          deskew: opts.deskew,
          orientation: opts.orientation,
          dropout: opts.dropout ?? false,
          attempts,
        });
        process.stdout.write(
          `${r.queued} job(s) queued on "${name}" at ${t.masked}` +
            (r.alreadyQueued > 0 ? `; ${r.alreadyQueued} input(s) already queued with the same file, schema and model` : '') +
            (r.skipped.length > 0 ? `; ${r.skipped.length} input(s) skipped (listed in the folder after collect)` : '') +
            '\n',
        );
      } finally {
        await q.close();
        redis.disconnect();
      }
    });
  });

  withRedis(
    queue
      .command('work')
      .description('Read queued jobs until stopped (Ctrl+C or SIGTERM finishes the jobs in hand first)')
      .option('--concurrency <n>', 'jobs this process reads at once', '1')
      .option('--schema <file>', 'a schema file this machine holds under another path than the submitter\'s; repeat', collect, [])
      .option('--model <file>', 'a detector this machine holds under another path; repeat', collect, [])
      .option('--digit-model <file>', 'a digit reader this machine holds under another path; repeat', collect, [])
      .option('--threads <n>', 'onnxruntime intra-op threads')
      .option('--lock-seconds <n>', 'how long a job stays with a worker that stopped answering before another takes it', '60')
      .option('--until-empty', 'stop once no job is waiting, delayed or running'),
  ).action(async (opts: RedisCliOptions & { concurrency: string; schema: string[]; model: string[]; digitModel: string[]; threads?: string; lockSeconds: string; untilEmpty?: boolean }) => {
    const concurrency = wholeNumber('--concurrency', opts.concurrency, 1);
    // 5 s at least: the lock is renewed at half its time, and a page can hold the event loop for a second or two.
    const lockSeconds = wholeNumber('--lock-seconds', opts.lockSeconds, 5);
    const threads = optionalWholeNumber('--threads', opts.threads);
    const { target: t, name } = target(opts);
    const resources = new WorkerResources({ schemas: opts.schema, models: opts.model, digitModels: opts.digitModel, threads });
    await (await connect()).masked(t, async () => {
      const redis = await (await connect()).connectRedis(t, 'worker');
      try {
        const { runWorker } = await import('../queue/worker.js');
        const r = await runWorker({ target: t, queueName: name, concurrency, lockSeconds, untilEmpty: opts.untilEmpty ?? false, log: logLine }, redis, resources);
        logLine(`stopped: ${r.completed} job(s) done, ${r.failed} set aside`);
      } finally {
        redis.disconnect();
        await resources.close();
      }
    });
  });

  withRedis(
    queue
      .command('status')
      .description('Jobs waiting, running, done and set aside, and the pages per second the workers deliver')
      .option('--list <n>', 'set-aside jobs to list with their error', '20')
      .option('--json', 'print the status as JSON'),
  ).action(async (opts: RedisCliOptions & { list: string; json?: boolean }) => {
    const list = wholeNumber('--list', opts.list, 0);
    const { target: t, name } = target(opts);
    await (await connect()).masked(t, async () => {
      const q = await (await connect()).openQueue(t, name);
      try {
        const s = await queueStatus(q, list);
        for (const j of s.setAsideJobs) j.error = mask(t, j.error);
        if (opts.json) return void process.stdout.write(JSON.stringify(s, null, 2) + '\n');
        const rate = s.pagesPerSecond === null ? '-' : s.pagesPerSecond.toFixed(2);
        process.stdout.write(
          `queue "${name}" at ${t.masked}: ${s.waiting} waiting, ${s.active} running, ${s.delayed} waiting to retry, ${s.done} done, ${s.setAside} set aside; ` +
            `${rate} pages/s over the last ${s.rateJobs} finished job(s)\n`,
        );
        for (const j of s.setAsideJobs) process.stdout.write(`set aside after ${j.attempts} attempt(s): ${printable(j.input)}: ${printable(j.error)}\n`);
        if (s.setAside > s.setAsideJobs.length) process.stdout.write(`... and ${s.setAside - s.setAsideJobs.length} more (--list N)\n`);
      } finally {
        await q.close();
      }
    });
  });

  withRedis(
    queue
      .command('retry')
      .description('Put set-aside jobs back in the queue with a fresh count of tries')
      .argument('[inputs...]', 'only these inputs (paths as submitted); default: every set-aside job'),
  ).action(async (inputs: string[], opts: RedisCliOptions) => {
    const { target: t, name } = target(opts);
    await (await connect()).masked(t, async () => {
      const q = await (await connect()).openQueue(t, name);
      try {
        const only = inputs.length > 0 ? new Set(inputs.map((i) => recordedPath(i))) : null;
        const back = await retrySetAside(q, only);
        process.stdout.write(`${back.length} job(s) back in queue "${name}"\n`);
        if (only !== null) {
          const missing = [...only].filter((i) => !back.includes(i));
          for (const m of missing) process.stderr.write(`${printable(m)}: no set-aside job for this input\n`);
          if (missing.length > 0) process.exitCode = 1;
        }
      } finally {
        await q.close();
      }
    });
  });

  queue
    .command('collect')
    .description('Fold what the workers wrote into results.jsonl, summary.json and the review queue')
    .requiredOption('--out <dir>', 'the results folder given to queue submit')
    .action(async (opts: { out: string }) => {
      const st = await stat(opts.out).catch(() => null);
      if (!st?.isDirectory()) throw configError(opts.out, 'results folder not found');
      const r = await collectResults(opts.out);
      process.stderr.write(`${r.inputs} input outcome(s) folded in${r.orphans > 0 ? `; ${r.orphans} temp file(s) left by stopped workers removed` : ''}\n`);
      process.stdout.write(summaryText(r.folder, opts.out));
      if (r.folder.documents.failed > 0) process.exitCode = 1;
    });
}
