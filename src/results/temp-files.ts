import { readdir, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { CROPS_DIR, REVIEW_DIR } from './review-layout.js';
import { processAlive } from '../io/process-alive.js';
import { OUTCOMES_DIR } from './layout.js';

/** Temp names src/io/atomic-write.ts gives: .<name>.<pid>.<8 hex>.tmp */
const TEMP_NAME = /^\..+\.(\d+)\.[0-9a-f]{8}\.tmp$/;

async function olderThan(file: string, ms: number): Promise<boolean> {
  const st = await stat(file).catch(() => null);
  return st !== null && Date.now() - st.mtimeMs > ms;
}

/**
 * Remove the temp files a killed run left in a results folder (they may hold crops of personal data). A temp file
 * whose writer still runs is left alone, so a run in progress elsewhere is never disturbed. Where writers run on
 * other machines (queue workers on a shared folder) a process id says nothing here: with `staleAfterMs`, a temp file
 * counts as left behind once it is that old instead. Returns how many went.
 */
export async function removeOrphanTemps(dir: string, options: { staleAfterMs?: number } = {}): Promise<number> {
  let removed = 0;
  for (const folder of [dir, path.join(dir, REVIEW_DIR), path.join(dir, REVIEW_DIR, CROPS_DIR), path.join(dir, OUTCOMES_DIR)]) {
    let names: string[];
    try {
      names = await readdir(folder);
    } catch {
      continue;
    }
    for (const name of names) {
      const m = TEMP_NAME.exec(name);
      if (!m) continue;
      if (options.staleAfterMs === undefined ? processAlive(Number(m[1])) : !(await olderThan(path.join(folder, name), options.staleAfterMs))) continue;
      await rm(path.join(folder, name), { force: true });
      removed++;
    }
  }
  return removed;
}
