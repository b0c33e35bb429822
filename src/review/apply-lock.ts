import { mkdir, open, readFile, rm } from 'node:fs/promises';
import path from 'node:path';
import { configError } from '../errors.js';

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * One apply at a time per results folder: two concurrent runs would each rewrite documents from what they read
 * and lose the other's changes. The lock file holds the owner's pid; a lock left by a process that no longer runs
 * (killed mid-apply) is taken over.
 */
export async function withApplyLock<T>(reviewFolder: string, work: () => Promise<T>): Promise<T> {
  await mkdir(reviewFolder, { recursive: true });
  const lock = path.join(reviewFolder, '.apply.lock');
  for (let attempt = 0; ; attempt++) {
    try {
      const h = await open(lock, 'wx');
      await h.writeFile(String(process.pid));
      await h.close();
      break;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST' || attempt > 0) throw err;
      const pid = Number.parseInt(await readFile(lock, 'utf8').catch(() => ''), 10);
      if (Number.isInteger(pid) && pid !== process.pid && alive(pid)) {
        throw configError(lock, `another review apply (pid ${pid}) is running on this results folder`);
      }
      await rm(lock, { force: true });
    }
  }
  try {
    return await work();
  } finally {
    await rm(lock, { force: true });
  }
}
