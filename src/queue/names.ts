import { configError } from '../errors.js';

/** Key prefix of everything formglean keeps in Redis (BullMQ's own keys and the id claims). */
export const KEY_PREFIX = 'formglean';
export const DEFAULT_QUEUE = 'formglean';

/** A queue name is part of Redis key names: plain letters, digits, '.', '_' and '-' only. */
export function checkQueueName(name: string): string {
  if (!/^[A-Za-z0-9._-]{1,100}$/.test(name)) {
    throw configError(undefined, `--queue "${name}": expected 1-100 letters, digits, '.', '_' or '-'`);
  }
  return name;
}
