import { readFileSync } from 'node:fs';
import { configError } from '../errors.js';

/**
 * Where the job queue lives, as given by --redis or FORMGLEAN_REDIS_URL: `redis://[user:password@]host[:port][/db]`,
 * or `rediss://...` for TLS (the scheme ioredis and the Redis CLI use). The password never leaves this object in
 * clear: everything printed or logged goes through `masked` or `mask()`.
 */
export interface RedisTarget {
  url: string;
  /** The URL with its password (and user) replaced by "***": safe to print. */
  masked: string;
  tls: boolean;
  /** PEM certificate authority for a server whose certificate a private CA signed (--redis-ca). */
  ca?: string;
  /** Secrets to scrub from any message before it is shown (the password, in clear and URL-encoded). */
  secrets: string[];
}

export const REDIS_URL_ENV = 'FORMGLEAN_REDIS_URL';

function maskedUrl(u: URL): string {
  const copy = new URL(u.href);
  // A lone user part (redis://secret@host) is how some services pass a token: masked as well.
  if (copy.password) copy.password = '***';
  else if (copy.username) copy.username = '***';
  return copy.href;
}

/**
 * Parse and check a Redis URL once, at the boundary. A URL is a usage error (exit 2) unless its scheme is redis: or
 * rediss: and it names a host; the message shows the masked URL only.
 */
export function parseRedisUrl(raw: string | undefined, caFile?: string): RedisTarget {
  const given = raw ?? process.env[REDIS_URL_ENV];
  if (given === undefined || given.trim() === '') {
    throw configError(undefined, `--redis <url> is required (or set ${REDIS_URL_ENV}), e.g. redis://127.0.0.1:6379`);
  }
  let u: URL;
  try {
    u = new URL(given.trim());
  } catch {
    // The raw text may hold a password: say only what shape was expected.
    throw configError(undefined, '--redis: not a URL; expected redis://[user:password@]host[:port][/db] or rediss://... for TLS');
  }
  const masked = maskedUrl(u);
  if (u.protocol !== 'redis:' && u.protocol !== 'rediss:') {
    throw configError(undefined, `--redis ${masked}: expected the scheme redis:// or rediss:// (TLS), not ${u.protocol}//`);
  }
  if (!u.hostname) throw configError(undefined, `--redis ${masked}: the URL names no host`);
  const db = u.pathname.replace(/^\//, '');
  if (db !== '' && !/^\d+$/.test(db)) throw configError(undefined, `--redis ${masked}: the database after the host must be a number`);
  let ca: string | undefined;
  if (caFile !== undefined) {
    try {
      ca = readFileSync(caFile, 'utf8');
    } catch (err) {
      throw configError(caFile, `cannot read the --redis-ca certificate file (${(err as NodeJS.ErrnoException).code ?? 'error'})`);
    }
    if (u.protocol !== 'rediss:') throw configError(caFile, `--redis-ca needs a rediss:// (TLS) URL, not ${masked}`);
  }
  const token = u.password || u.username;
  const secrets = [token, decodeURIComponent(token)].filter((s) => s.length > 0);
  return { url: u.href, masked, tls: u.protocol === 'rediss:', ca, secrets };
}

/** The text with every secret of the target replaced by "***" (errors from drivers may echo what they were given). */
export function mask(target: RedisTarget, text: string): string {
  let out = text.split(target.url).join(target.masked);
  for (const s of target.secrets) out = out.split(s).join('***');
  return out;
}

/**
 * ioredis connection options. Workers wait out a Redis restart (maxRetriesPerRequest null, which BullMQ requires for
 * workers); one-shot commands (submit, status, retry) give up on a dead server instead of hanging.
 */
export function connectionOptions(target: RedisTarget, kind: 'worker' | 'command'): Record<string, unknown> {
  return {
    url: target.url,
    ...(target.ca !== undefined ? { tls: { ca: target.ca } } : {}),
    maxRetriesPerRequest: kind === 'worker' ? null : 2,
    // Reconnect backoff: 100 ms growing to 2 s (common practice for a server that restarts in seconds).
    retryStrategy: (times: number) => Math.min(100 * times, 2000),
    connectTimeout: 10_000,
  };
}
