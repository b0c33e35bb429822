import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Rng } from '../../src/synth/prng.js';
import { applyKillTrial, extractFixture, extractKillTrial, type ExtractFixture } from './kill-trial.js';

/**
 * SIGKILL trials at random points, a small sample (bench/kill-trials.ts runs many more and prints the counts).
 * The points are drawn from FORMGLEAN_KILL_SEED when set, so that a failing draw can be repeated.
 */
const seed = Number(process.env.FORMGLEAN_KILL_SEED ?? Date.now() % 100_000);
const rng = new Rng(seed);
const next = () => rng.next();

let work: string;
let fx: ExtractFixture;
const dirs: string[] = [];

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-kill-trials-'));
  fx = await extractFixture(work);
}, 300_000);

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

describe(`SIGKILL at random points (seed ${seed})`, () => {
  it('extract: the rerun gives the same values, no temp file, no lost answer', async () => {
    const resume = next() < 0.5;
    // A --resume run reads one new scan instead of two: its kill points spread over a shorter span.
    const outcome = await extractKillTrial(fx, path.join(work, 'trial'), Math.round(next() * fx.extractMs * (resume ? 0.6 : 1)), resume);
    expect(outcome).toMatchObject({ rerunCode: 0, identical: true, orphans: [], lostAnswers: 0 });
  }, 300_000);

  it('review apply: the rerun holds every answer once in the records and the audit, no temp file or lock left', async () => {
    for (let i = 0; i < 2; i++) {
      const outcome = await applyKillTrial(150, Math.round(next() * 1000));
      dirs.push(outcome.dir);
      expect(outcome).toMatchObject({ rerunCode: 0, identical: true, orphans: [], lostAnswers: 0 });
    }
  }, 300_000);
});
