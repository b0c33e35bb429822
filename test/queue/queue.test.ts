/**
 * The Redis job queue end to end: real redis-server processes (Debian's package), real worker processes running the
 * command line, the real detector and OCR on the bundled demo scans. Skipped with a reason where redis-server is not
 * installed, failed instead under FORMGLEAN_REQUIRE_ALL=1 (CI installs it).
 */
import { copyFile, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REPO, runCli, startCli, type CliRun, type StartedCli } from '../cli/run-cli.js';
import { skipUnlessPresent } from '../support/requirements.js';
import { missingRedisServer, startRedis, type TestRedis } from './redis-server.js';

const missing = missingRedisServer();
const SAMPLE = path.join(REPO, 'samples/marina-slip-typed.jpg');
const SCHEMA = path.join(REPO, 'schemas/marina-slip.yaml');
// A password with characters a URL must escape, so masking is tried on the encoded and the plain form.
const PASSWORD = 'pw-Xq7/secret+sv';

let work: string;
beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-queue-'));
});
afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

/** A folder of `n` scans (copies of one bundled demo scan under their own names: separate inputs, separate records). */
async function inputs(name: string, n: number): Promise<string> {
  const dir = path.join(work, name, 'scans');
  await mkdir(dir, { recursive: true });
  for (let i = 0; i < n; i++) await copyFile(SAMPLE, path.join(dir, `slip-${String.fromCharCode(97 + i)}.jpg`));
  return dir;
}

function queueCli(args: string[], redis: TestRedis): Promise<CliRun> {
  return runCli(['queue', ...args], { env: { FORMGLEAN_REDIS_URL: redis.url } });
}

/**
 * A worker that stops when the queue is empty. The job lock must outlast the longest stretch a page holds the event
 * loop (the lock is renewed from a timer): on two cores shared with other test files that measured over 5 s, and a
 * 5 s lock then set jobs aside as stalled while they were being read. 30 s here; the kill test takes 15 s to be
 * quicker and asserts nothing a late renewal could break.
 */
function startWorker(redis: TestRedis, extra: string[] = []): StartedCli {
  return startCli(['queue', 'work', '--until-empty', '--lock-seconds', '30', ...extra], { env: { FORMGLEAN_REDIS_URL: redis.url } });
}

async function resultsLines(out: string): Promise<{ document: string; ok: boolean; error?: string; path: string }[]> {
  return (await readFile(path.join(out, 'results.jsonl'), 'utf8')).trim().split('\n').filter(Boolean).map((l) => JSON.parse(l));
}

async function recordFiles(out: string): Promise<string[]> {
  return (await readdir(out)).filter((n) => n.endsWith('.json') && n !== 'summary.json').sort();
}

/** Each input read once: one ok line and one record per scan, ids as submit decided them (no "-2" from a rerun). */
async function expectEveryDocumentOnce(out: string, n: number): Promise<void> {
  const lines = await resultsLines(out);
  const ids = lines.map((l) => l.document).sort();
  const expected = Array.from({ length: n }, (_, i) => `slip-${String.fromCharCode(97 + i)}`);
  expect(ids).toEqual(expected);
  expect(lines.every((l) => l.ok)).toBe(true);
  expect(await recordFiles(out)).toEqual(expected.map((id) => `${id}.json`));
  // Nothing left to fold in.
  expect(await readdir(path.join(out, 'outcomes'))).toEqual([]);
}

async function waitFor(what: string, check: () => Promise<boolean> | boolean, ms = 180_000): Promise<void> {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** Every string value Redis holds, dumped key by key (for the check that no field value reached the server). */
async function dumpRedis(url: string): Promise<string> {
  const client = new Redis(url);
  try {
    const out: string[] = [];
    for (const key of await client.keys('*')) {
      const type = await client.type(key);
      if (type === 'string') out.push(key, (await client.get(key)) ?? '');
      else if (type === 'hash') out.push(key, JSON.stringify(await client.hgetall(key)));
      else if (type === 'list') out.push(key, JSON.stringify(await client.lrange(key, 0, -1)));
      else if (type === 'set') out.push(key, JSON.stringify(await client.smembers(key)));
      else if (type === 'zset') out.push(key, JSON.stringify(await client.zrange(key, 0, -1)));
      else if (type === 'stream') out.push(key, JSON.stringify(await client.xrange(key, '-', '+')));
    }
    return out.join('\n');
  } finally {
    client.disconnect();
  }
}

/** The server's run id: a new one on every start (Redis INFO server, run_id). */
async function serverRunId(url: string): Promise<string> {
  const client = new Redis(url);
  try {
    return /run_id:(\w+)/.exec(await client.info('server'))?.[1] ?? '';
  } finally {
    client.disconnect();
  }
}

describe('queue: workers on one Redis', () => {
  it('two worker processes share a batch: every document once, no field value in Redis, the password never printed', async (ctx) => {
    skipUnlessPresent(ctx, missing);
    const redis = await startRedis({ password: PASSWORD });
    try {
      const scans = await inputs('share', 4);
      const out = path.join(work, 'share', 'out');
      const submit = await queueCli(['submit', scans, '--schema', SCHEMA, '--out', out], redis);
      expect(submit.stderr).toBe('');
      expect(submit.code).toBe(0);
      expect(submit.stdout).toMatch(/^4 job\(s\) queued on "formglean" at redis:\/\/:\*\*\*@127\.0\.0\.1:\d+/);
      // Submitting again queues nothing twice.
      const again = await queueCli(['submit', scans, '--schema', SCHEMA, '--out', out], redis);
      expect(again.stdout).toMatch(/^0 job\(s\) queued .*; 4 input\(s\) already queued/);

      // Held back until both workers are up, so that each takes a job at once however slowly either process starts.
      const queue = new Queue('formglean', { connection: { url: redis.url }, prefix: 'formglean' });
      await queue.pause();
      const workers = [startWorker(redis), startWorker(redis)];
      await waitFor('both workers serving', () => workers.every((w) => /serving queue/.test(w.stderr())));
      await queue.resume();
      await queue.close();
      const done = await Promise.all(workers.map((w) => w.done));
      expect(done.map((d) => d.code)).toEqual([0, 0]);
      // Both took part: each logged at least one input read.
      for (const d of done) expect(d.stderr).toMatch(/slip-[a-d]\.jpg: 1 form\(s\) read, 0 failed, 1 page\(s\)/);
      const reads = done.map((d) => (d.stderr.match(/form\(s\) read/g) ?? []).length);
      expect(reads[0] + reads[1]).toBe(4);

      const collect = await queueCli(['collect', '--out', out], redis);
      expect(collect.code).toBe(0);
      expect(collect.stdout).toMatch(/^4 of 4 documents processed/);
      await expectEveryDocumentOnce(out, 4);

      const status = await queueCli(['status'], redis);
      expect(status.stdout).toMatch(/0 waiting, 0 running, 0 waiting to retry, 4 done, 0 set aside; \d+\.\d\d pages\/s/);

      // Jobs hold paths and hashes: none of the values read from the forms is anywhere in Redis.
      const dump = await dumpRedis(redis.url);
      const record = JSON.parse(await readFile(path.join(out, 'slip-a.json'), 'utf8')) as { fields: { value: unknown }[] };
      const values = record.fields.map((f) => f.value).filter((v): v is string => typeof v === 'string' && v.length >= 4);
      expect(values.length).toBeGreaterThan(3);
      for (const v of values) expect(dump).not.toContain(v);

      for (const run of [submit, again, collect, status, ...done]) {
        expect(run.stdout + run.stderr).not.toContain(PASSWORD);
        expect(run.stdout + run.stderr).not.toContain(encodeURIComponent(PASSWORD));
      }
    } finally {
      await redis.dispose();
    }
  }, 400_000);

  it('a worker killed with SIGKILL mid-document: another takes its job over and the batch completes with every document once', async (ctx) => {
    skipUnlessPresent(ctx, missing);
    const redis = await startRedis();
    const queue = new Queue('formglean', { connection: { url: redis.url }, prefix: 'formglean' });
    try {
      const scans = await inputs('kill', 2);
      const out = path.join(work, 'kill', 'out');
      expect((await queueCli(['submit', scans, '--schema', SCHEMA, '--out', out], redis)).code).toBe(0);
      const doomed = startWorker(redis, ['--lock-seconds', '15']);
      await waitFor('a job in hand', async () => (await queue.getActiveCount()) === 1);
      // Killed a second into the document (one takes several seconds here), before its record is written.
      await new Promise((r) => setTimeout(r, 1000));
      doomed.child.kill('SIGKILL');
      const killed = await doomed.done;
      expect(killed.signal).toBe('SIGKILL');
      expect(killed.stderr).not.toMatch(/form\(s\) read/);

      const rescuer = startWorker(redis, ['--lock-seconds', '15']);
      const done = await rescuer.done;
      expect(done.code).toBe(0);
      expect((done.stderr.match(/form\(s\) read/g) ?? []).length).toBe(2);
      expect((await queueCli(['collect', '--out', out], redis)).code).toBe(0);
      await expectEveryDocumentOnce(out, 2);
    } finally {
      await queue.close();
      await redis.dispose();
    }
  }, 400_000);

  it('Redis restarted mid-batch (append-only file on): the worker reconnects and the batch completes with every document once', async (ctx) => {
    skipUnlessPresent(ctx, missing);
    const redis = await startRedis({ persist: true });
    try {
      const scans = await inputs('restart', 3);
      const out = path.join(work, 'restart', 'out');
      expect((await queueCli(['submit', scans, '--schema', SCHEMA, '--out', out], redis)).code).toBe(0);
      const worker = startWorker(redis);
      // The second document is in hand when the server goes down.
      await waitFor('the first document read', () => /form\(s\) read/.test(worker.stderr()));
      const runId = () => serverRunId(redis.url);
      const before = await runId();
      await redis.stop();
      await new Promise((r) => setTimeout(r, 1500));
      await redis.start();
      expect(await runId()).not.toBe(before);
      const done = await worker.done;
      expect(done.code).toBe(0);
      expect(done.stderr).toMatch(/queue connection lost; reconnecting to redis:\/\/127\.0\.0\.1:\d+[^\n]*\n(.*\n)*.*queue connection: back/);
      expect((await queueCli(['collect', '--out', out], redis)).code).toBe(0);
      await expectEveryDocumentOnce(out, 3);
    } finally {
      await redis.dispose();
    }
  }, 400_000);

  it('a job whose schema hash no worker file has is refused, set aside with its error, and read after `queue retry`', async (ctx) => {
    skipUnlessPresent(ctx, missing);
    const redis = await startRedis();
    try {
      const scans = await inputs('refuse', 1);
      const out = path.join(work, 'refuse', 'out');
      // The submitter's schema, beside its blank image; edited after submit, so its path no longer has the hash.
      const schemaDir = path.join(work, 'refuse', 'schema');
      await mkdir(schemaDir);
      const schema = path.join(schemaDir, 'marina-slip.yaml');
      await copyFile(SCHEMA, schema);
      await copyFile(path.join(REPO, 'schemas/marina-slip.blank.png'), path.join(schemaDir, 'marina-slip.blank.png'));
      expect((await queueCli(['submit', scans, '--schema', schema, '--out', out, '--attempts', '1'], redis)).code).toBe(0);
      await writeFile(schema, (await readFile(schema, 'utf8')) + '\n# edited after submit\n');

      const refused = await startWorker(redis).done;
      expect(refused.code).toBe(0);
      expect(refused.stderr).toMatch(/slip-a\.jpg: set aside after 1 attempt\(s\): .*marina-slip\.yaml: schema with sha256 [0-9a-f]{12}\.\.\. not found on this worker/);
      const status = await queueCli(['status'], redis);
      expect(status.stdout).toMatch(/0 done, 1 set aside/);
      expect(status.stdout).toMatch(/set aside after 1 attempt\(s\): .*slip-a\.jpg: .*not found on this worker/);
      const failed = await queueCli(['collect', '--out', out], redis);
      expect(failed.code).toBe(1);
      expect((await resultsLines(out))[0]).toMatchObject({ document: 'slip-a', ok: false, error: expect.stringMatching(/^set aside after 1 attempt/) });

      const retry = await queueCli(['retry'], redis);
      expect(retry.stdout).toBe('1 job(s) back in queue "formglean"\n');
      // This worker offers the original schema file under its own path: found by its hash.
      const read = await startWorker(redis, ['--schema', SCHEMA]).done;
      expect(read.stderr).toMatch(/slip-a\.jpg: 1 form\(s\) read/);
      expect((await queueCli(['collect', '--out', out], redis)).code).toBe(0);
      await expectEveryDocumentOnce(out, 1);
    } finally {
      await redis.dispose();
    }
  }, 400_000);
});
