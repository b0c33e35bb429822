/**
 * SIGKILL trials: real `extract` and `review apply` processes killed at random moments, each followed by the same
 * command run again (extract with --resume). Every trial must end with the values of an uninterrupted run, no temp
 * file, journal or lock left, and every review answer in the records (and, for apply, once in the audit log).
 * Prints one line per trial and the totals. test/cli/kill-trials.test.ts runs a small sample of the same trials.
 *
 *   npx tsx bench/kill-trials.ts [--extract 10] [--apply 12] [--seed 18] [--documents 150]
 *
 * Apply kill points fall in the first second after the first document is written: an apply of 150 documents spends
 * about 1 s writing (measured here: kills later than ~1.2 s came after the end).
 */
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { Rng } from '../src/synth/prng.js';
import { applyKillTrial, extractFixture, extractKillTrial, type TrialOutcome } from '../test/cli/kill-trial.js';

const { values: args } = parseArgs({
  options: {
    extract: { type: 'string', default: '10' },
    apply: { type: 'string', default: '12' },
    seed: { type: 'string', default: '18' },
    documents: { type: 'string', default: '150' },
  },
});

const rng = new Rng(Number(args.seed));
const work = await mkdtemp(path.join(os.tmpdir(), 'fg-kill-bench-'));
const outcomes: TrialOutcome[] = [];
const report = (o: TrialOutcome) => {
  outcomes.push(o);
  const ok = o.rerunCode === 0 && o.identical && o.orphans.length === 0 && o.lostAnswers === 0;
  console.log(
    `${String(outcomes.length).padStart(2)} ${o.kind.padEnd(16)} kill at ${String(o.killAfterMs).padStart(6)} ms${o.kind === 'review apply' ? ' after its first write' : ''}` +
      `${o.killedMidway ? ' (mid-run)' : ' (after end)'}: rerun exit ${o.rerunCode}, values ${o.identical ? 'identical' : 'DIFFER'}, ` +
      `orphans ${o.orphans.length}, answers lost ${o.lostAnswers}/${o.answers} ${ok ? 'ok' : 'FAIL'}`,
  );
};

try {
  const fx = await extractFixture(work);
  console.log(`fixture: 2 scans extracted in ${fx.extractMs} ms, ${fx.answers} review answers applied`);
  for (let i = 0; i < Number(args.extract); i++) {
    // A --resume run reads one new scan instead of two: its kill points spread over a shorter span.
    const resume = i % 2 === 1;
    report(await extractKillTrial(fx, path.join(work, 'trial'), Math.round(rng.next() * fx.extractMs * (resume ? 0.6 : 1)), resume));
  }
  for (let i = 0; i < Number(args.apply); i++) {
    const o = await applyKillTrial(Number(args.documents), Math.round(rng.next() * 1000));
    await rm(o.dir, { recursive: true, force: true });
    report(o);
  }
} finally {
  await rm(work, { recursive: true, force: true });
}
const midway = outcomes.filter((o) => o.killedMidway).length;
const failed = outcomes.filter((o) => !(o.rerunCode === 0 && o.identical && o.orphans.length === 0 && o.lostAnswers === 0)).length;
const answers = outcomes.reduce((n, o) => n + o.answers, 0);
const lost = outcomes.reduce((n, o) => n + o.lostAnswers, 0);
console.log(`\n${outcomes.length} trials (${midway} killed mid-run), ${failed} failed; answers lost ${lost} of ${answers}`);
process.exitCode = failed > 0 ? 1 : 0;
