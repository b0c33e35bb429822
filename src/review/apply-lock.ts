import { randomBytes } from 'node:crypto';
import { link, mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import path from 'node:path';
import { configError } from '../errors.js';
import { processAlive } from '../io/process-alive.js';

/** What the lock file holds: who owns it. Written whole before the lock exists (link), so it is never empty. */
interface Owner {
  pid: number;
  host: string;
  token: string;
}

function parseOwner(text: string): Owner | null {
  // Earlier versions wrote the bare pid (on this machine, with the same pid rule).
  if (/^\d+$/.test(text.trim())) return { pid: Number(text.trim()), host: hostname(), token: `pid-${text.trim()}` };
  try {
    const o = JSON.parse(text) as Partial<Owner>;
    return typeof o.pid === 'number' && typeof o.host === 'string' && typeof o.token === 'string' ? (o as Owner) : null;
  } catch {
    return null;
  }
}

async function readOwner(file: string): Promise<Owner | null | 'gone'> {
  try {
    return parseOwner(await readFile(file, 'utf8'));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return 'gone';
    throw err;
  }
}

/** A lock whose owner ran on this machine and no longer does: the only kind ever taken over. */
function isStale(owner: Owner): boolean {
  return owner.host === hostname() && !processAlive(owner.pid);
}

/**
 * Take the lock file, or say who holds it. The owner record is written to a private file first and then hard-linked
 * to the lock name: link() fails when the name exists, so taking is atomic and a lock file is never seen empty.
 * A lock is taken over only when its record names a process of this machine that has ended; a lock file that cannot
 * be read as a record (hand-made, or from another tool) is never removed, since its owner may still be running.
 * A takeover first renames the stale lock aside and checks that what it moved is the stale record it judged, so two
 * runs taking over at once cannot both win.
 */
async function acquire(lock: string, me: Owner): Promise<void> {
  // Named like src/io/atomic-write.ts's temp files, so that a run killed here leaves nothing the next run keeps.
  const mine = `${lock}.${me.pid}.${me.token.slice(0, 8)}.tmp`;
  await writeFile(mine, JSON.stringify(me));
  try {
    for (let attempt = 0; attempt < 5; attempt++) {
      try {
        await link(mine, lock);
        return;
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      }
      const owner = await readOwner(lock);
      if (owner === 'gone') continue;
      if (owner === null) {
        throw configError(lock, 'lock file is not a formglean lock record; if no review apply is running on this folder, delete it');
      }
      if (!isStale(owner)) {
        throw configError(lock, `another review apply (pid ${owner.pid}${owner.host !== me.host ? ` on ${owner.host}` : ''}) is running on this results folder`);
      }
      const aside = `${lock}.stale.${me.pid}.${me.token.slice(8, 16)}.tmp`;
      try {
        await rename(lock, aside);
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') continue;
        throw err;
      }
      const moved = await readOwner(aside);
      if (moved !== 'gone' && moved !== null && moved.token !== owner.token) {
        // We moved a live run's fresh lock, not the stale one: put it back and give way.
        await link(aside, lock).catch(() => undefined);
        await rm(aside, { force: true });
        throw configError(lock, `another review apply (pid ${moved.pid}) is running on this results folder`);
      }
      await rm(aside, { force: true });
    }
    throw configError(lock, 'could not take the apply lock (other runs keep taking it); try again');
  } finally {
    await rm(mine, { force: true });
  }
}

/**
 * One apply at a time per results folder: two concurrent runs would each rewrite documents from what they read
 * and lose the other's changes. The lock is released only by its owner, and only while it still holds its record.
 */
export async function withApplyLock<T>(reviewFolder: string, work: () => Promise<T>): Promise<T> {
  await mkdir(reviewFolder, { recursive: true });
  const lock = path.join(reviewFolder, '.apply.lock');
  const me: Owner = { pid: process.pid, host: hostname(), token: randomBytes(8).toString('hex') };
  await acquire(lock, me);
  try {
    return await work();
  } finally {
    const owner = await readOwner(lock).catch(() => null);
    if (owner !== null && owner !== 'gone' && owner.token === me.token) await rm(lock, { force: true });
  }
}
