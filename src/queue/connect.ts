import { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { configError, FormgleanError, oneLine } from '../errors.js';
import { KEY_PREFIX } from './names.js';
import { connectionOptions, mask, type RedisTarget } from './redis-url.js';

/**
 * Check that Redis answers with these credentials, or throw a one-line usage error (exit 2) naming the masked URL.
 * Probing first means a wrong host or password is reported at once instead of as a command that waits for ever
 * (the clients below reconnect without end, so that workers ride out a Redis restart).
 */
async function probe(target: RedisTarget): Promise<void> {
  const { url, ...rest } = connectionOptions(target, 'command');
  const client = new Redis(url as string, { ...rest, lazyConnect: true, retryStrategy: () => null });
  // connect() rejects with a bare "Connection is closed"; the cause (refused, wrong password, TLS) comes as an event.
  let cause: unknown = null;
  client.on('error', (err) => (cause ??= err));
  try {
    await client.connect();
    await client.ping();
  } catch (err) {
    throw configError(undefined, `cannot use Redis at ${target.masked}: ${mask(target, oneLine(cause ?? err))}`);
  } finally {
    client.disconnect();
  }
}

/** A plain Redis client (id claims), after the probe. */
export async function connectRedis(target: RedisTarget, kind: 'worker' | 'command'): Promise<Redis> {
  await probe(target);
  const { url, ...rest } = connectionOptions(target, kind);
  const live = new Redis(url as string, rest);
  live.on('error', () => {}); // a client reconnects by itself; the worker's error handler reports outages
  return live;
}

/** The BullMQ queue (submit, status, retry), after the probe. */
export async function openQueue(target: RedisTarget, name: string): Promise<Queue> {
  await probe(target);
  const queue = new Queue(name, { connection: connectionOptions(target, 'command'), prefix: KEY_PREFIX });
  queue.on('error', () => {}); // every call awaits its own result and reports its error
  return queue;
}

/** Run a queue command, turning any error into one line with the Redis password masked. */
export async function masked<T>(target: RedisTarget, run: () => Promise<T>): Promise<T> {
  try {
    return await run();
  } catch (err) {
    const message = mask(target, oneLine(err));
    throw new FormgleanError(message, { exitCode: err instanceof FormgleanError ? err.exitCode : 1 });
  }
}
