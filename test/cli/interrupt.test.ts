import { access, mkdtemp, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readIndex } from '../../src/results/index-read.js';
import { generateSamples } from '../../src/synth/generate.js';
import { REPO, startCli, type StartedCli } from './run-cli.js';

const SCHEMA = path.join(REPO, 'schemas/clinic-intake.yaml');
let work: string;
let gen: string;

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-interrupt-'));
  gen = path.join(work, 'gen');
  // Held-out seeds (>= 900000): never used for training the detector.
  await generateSamples({ layout: 'clinic-intake', count: 5, seed: 900_641, out: gen, fill: 'typed', degrade: 'light', styles: 'train', format: 'png', upsideDownRate: 0 });
}, 120_000);

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

/** Resolves once the command has printed its first finished input. */
function firstInputDone(run: StartedCli): Promise<void> {
  return new Promise((resolve, reject) => {
    const poll = setInterval(() => {
      if (/^\[1\/5\]/m.test(run.stderr())) {
        clearInterval(poll);
        resolve();
      }
    }, 50);
    void run.done.then(() => {
      clearInterval(poll);
      reject(new Error(`the command ended before its first input: ${run.stderr()}`));
    });
  });
}

const pages = () => ['extract', path.join(gen, '*.png')];

describe('extract stopped by a signal (real child process, real SIGINT and SIGTERM)', () => {
  it('Ctrl-C finishes the document in progress, writes the index and the review queue, and exits 130', async () => {
    const out = path.join(work, 'out-int');
    const run = startCli([...pages(), '--schema', SCHEMA, '--out', out, '--workers', '1']);
    await firstInputDone(run);
    run.child.kill('SIGINT');
    const end = await run.done;
    // 128 + SIGINT's number 2, as shells report an interrupted command (common practice).
    expect(end.code).toBe(130);
    expect(end.stderr).toMatch(/^SIGINT: finishing the documents in progress/m);
    expect(end.stderr).toMatch(/^interrupted by SIGINT: [1-4] of 5 input\(s\) not started; .* --resume to go on$/m);
    expect(end.stderr).not.toMatch(/\n\s+at /);
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.run.interrupted).toBe(true);
    const read = summary.run.inputs.read as number;
    expect(read).toBeGreaterThanOrEqual(1);
    expect(read + summary.run.inputs.notReached).toBe(5);
    // The index lists every input that was read, whole, and no journal is left to replay.
    const lines = (await readFile(path.join(out, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(lines).toHaveLength(read);
    expect(lines.every((l) => l.ok)).toBe(true);
    for (const l of lines) await access(path.join(out, l.json));
    await expect(access(path.join(out, 'results.journal.jsonl'))).rejects.toThrow();
    await access(path.join(out, 'review', 'queue.csv'));

    // The same command with --resume reads only what was not reached.
    const rest = startCli([...pages(), '--schema', SCHEMA, '--out', out, '--workers', '1', '--resume']);
    const done = await rest.done;
    expect(done.code).toBe(0);
    expect(done.stderr.split('\n').filter((l) => l.endsWith('(unchanged, kept)'))).toHaveLength(read);
    const after = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(after.documents).toEqual({ total: 5, processed: 5, failed: 0 });
  }, 600_000);

  it('a second signal stops at once; the folder still lists every input finished before it', async () => {
    const out = path.join(work, 'out-term');
    const run = startCli([...pages(), '--schema', SCHEMA, '--out', out, '--workers', '1']);
    await firstInputDone(run);
    run.child.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 200));
    run.child.kill('SIGTERM');
    const end = await run.done;
    expect(end.code).toBe(143); // 128 + SIGTERM's number 15
    expect(end.stderr).toMatch(/^SIGTERM again: stopped at once/m);
    // Any reader replays the journal: the first input finished is listed although no index was written at the end.
    // Which input finishes first is not fixed: the thread reads two at once (src/batch/inputs-per-thread.ts).
    const first = /^\[1\/5\] (.+?): /m.exec(end.stderr)![1];
    const index = await readIndex(out, () => undefined);
    expect(index.lines.filter((l) => l.ok).map((l) => l.document)).toContain(path.basename(first, '.png'));
  }, 600_000);
});
