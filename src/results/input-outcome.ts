import { createHash } from 'node:crypto';
import { readdir, readFile, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { writeJsonAtomic } from '../io/atomic-write.js';
import { OUTCOMES_DIR } from './layout.js';
import { ResultsLine } from './results-line.js';

/**
 * What one input added to the results folder, written by whoever read it (a queue worker on any machine) as its own
 * file: DIR/outcomes/<hash of the input's recorded path>.json. Workers on several machines never append to one shared
 * file (appends over a network file system can interleave); each writes its own, atomically, and a retried job
 * replaces it whole. `queue collect` merges them into results.jsonl. Lines carry ids, counts and errors, no values.
 */
export const InputOutcomeFile = z.object({ path: z.string(), lines: z.array(ResultsLine) });
export type InputOutcomeFile = z.infer<typeof InputOutcomeFile>;

export function outcomeFileName(recorded: string): string {
  return `${createHash('sha256').update(recorded).digest('hex').slice(0, 32)}.json`;
}

export async function writeInputOutcome(outDir: string, outcome: InputOutcomeFile): Promise<void> {
  await writeJsonAtomic(path.join(outDir, OUTCOMES_DIR, outcomeFileName(outcome.path)), outcome);
}

/** An outcome file taken by a collect run that has not finished writing the index yet. */
const TAKEN = '.taken';

export interface TakenOutcomes {
  outcomes: InputOutcomeFile[];
  /** Delete the files taken, once the index that holds them is written. */
  release: () => Promise<void>;
}

/**
 * Take every outcome file of the folder for folding into the index: each is first renamed to <name>.taken, so a
 * worker that writes the same input again meanwhile makes a new file, kept for the next collect, instead of one
 * deleted unread. Files a collect cut off earlier left taken are taken again (older first, so the newer file of an
 * input wins). A damaged file is reported by name and left out.
 */
export async function takeInputOutcomes(outDir: string, warn: (message: string) => void): Promise<TakenOutcomes> {
  const dir = path.join(outDir, OUTCOMES_DIR);
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => !n.startsWith('.'));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return { outcomes: [], release: async () => {} };
    throw err;
  }
  const taken = names.filter((n) => n.endsWith(`.json${TAKEN}`)).sort();
  for (const n of names.filter((n) => n.endsWith('.json')).sort()) {
    await rename(path.join(dir, n), path.join(dir, n + TAKEN));
    taken.push(n + TAKEN);
  }
  const outcomes: InputOutcomeFile[] = [];
  for (const name of taken) {
    const file = path.join(dir, name);
    try {
      const parsed = InputOutcomeFile.safeParse(JSON.parse(await readFile(file, 'utf8')));
      if (parsed.success) outcomes.push(parsed.data);
      else warn(`${file}: not an input outcome file; left out`);
    } catch {
      warn(`${file}: unreadable input outcome file; left out`);
    }
  }
  return { outcomes, release: async () => { for (const n of taken) await rm(path.join(dir, n), { force: true }); } };
}
