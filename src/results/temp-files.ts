import { readdir, rm } from 'node:fs/promises';
import path from 'node:path';
import { CROPS_DIR, REVIEW_DIR } from './review-layout.js';
import { processAlive } from '../io/process-alive.js';

/** Temp names src/io/atomic-write.ts gives: .<name>.<pid>.<8 hex>.tmp */
const TEMP_NAME = /^\..+\.(\d+)\.[0-9a-f]{8}\.tmp$/;

/**
 * Remove the temp files a killed run left in a results folder (they may hold crops of personal data). A temp file
 * whose writer still runs is left alone, so a run in progress elsewhere is never disturbed. Returns how many went.
 */
export async function removeOrphanTemps(dir: string): Promise<number> {
  let removed = 0;
  for (const folder of [dir, path.join(dir, REVIEW_DIR), path.join(dir, REVIEW_DIR, CROPS_DIR)]) {
    let names: string[];
    try {
      names = await readdir(folder);
    } catch {
      continue;
    }
    for (const name of names) {
      const m = TEMP_NAME.exec(name);
      if (!m || processAlive(Number(m[1]))) continue;
      await rm(path.join(folder, name), { force: true });
      removed++;
    }
  }
  return removed;
}
