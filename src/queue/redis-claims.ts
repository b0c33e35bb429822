import { createHash } from 'node:crypto';
import type { Redis } from 'ioredis';
import type { ResultsLine } from '../results/results-line.js';

/**
 * Document ids of one results folder, claimed in Redis so that workers on several machines never give two inputs one
 * record: the same rule as src/batch/id-claims.ts (a taken id gets -2, -3, ...; compared without case), run as one
 * Lua script so the look-up and the claim are one atomic step (Redis runs a script without interleaving other
 * commands: redis.io, "Scripting with Lua", atomicity). An input asking again (a retried job) gets the id it holds.
 */
const CLAIM_SCRIPT = `
local id, file = ARGV[1], ARGV[2]
local unique = id
local n = 2
while true do
  local holder = redis.call('HGET', KEYS[1], string.lower(unique))
  if not holder then
    redis.call('HSET', KEYS[1], string.lower(unique), file)
    return unique
  end
  if holder == file then return unique end
  unique = id .. '-' .. n
  n = n + 1
end
`;

/** The Redis hash holding a results folder's claims; the folder is named by a hash of its path (no path in key names). */
export function claimsKey(prefix: string, queueName: string, outDirAbs: string): string {
  const folder = createHash('sha256').update(outDirAbs).digest('hex').slice(0, 24);
  return `${prefix}:${queueName}:claims:${folder}`;
}

export async function claimId(redis: Redis, key: string, requested: string, recorded: string): Promise<string> {
  return (await redis.eval(CLAIM_SCRIPT, 1, key, requested, recorded)) as string;
}

/** Ids the folder already lists for inputs outside this submission: held for them, as the local batch does. */
export async function seedClaims(redis: Redis, key: string, kept: readonly ResultsLine[]): Promise<void> {
  const pairs = kept.filter((l) => l.document).flatMap((l) => [l.document.toLowerCase(), l.path]);
  for (let i = 0; i < pairs.length; i += 2) await redis.hsetnx(key, pairs[i], pairs[i + 1]);
}
