import { z } from 'zod';

const Sha256 = z.string().regex(/^[0-9a-f]{64}$/, 'a sha256 in hex');

/** A file that travels by hash: the path submit saw, and the hash a worker must find behind whatever path it uses. */
export const HashedFile = z.object({ path: z.string().min(1), sha256: Sha256 });
export type HashedFile = z.infer<typeof HashedFile>;

/**
 * One queued job: one input file. Paths and hashes only, never a field value (the queue lives on a server that
 * other people operate). Paths are absolute as the submitting machine resolved them: every worker mounts the shared
 * folder at the same place.
 */
export const JobPayload = z.object({
  /** Format of this payload, so a newer worker can refuse an older job clearly. */
  v: z.literal(1),
  /** Results folder (absolute). */
  outDir: z.string().min(1),
  /** Input file (absolute) and its hash at submit time: a file changed since is refused, not read. */
  input: HashedFile,
  /** The path as records and results.jsonl write it (see results/recorded-path). */
  recorded: z.string().min(1),
  /** Record id decided at submit time (unique in the batch); a stack's forms get stem.p1, stem.p2, ... */
  stem: z.string().min(1),
  /** Records an earlier run wrote for this input (file names in outDir): reviewed answers carry over. */
  earlierJson: z.array(z.string()),
  schemas: z.array(HashedFile).min(1),
  model: HashedFile,
  /** The digit reader for digit combs, or null to read them with Tesseract alone. */
  digitModel: HashedFile.nullable(),
  deskew: z.boolean(),
  orientation: z.boolean(),
  dropout: z.boolean(),
  /** Key of the Redis hash that holds this results folder's id claims. */
  claimsKey: z.string().min(1),
});
export type JobPayload = z.infer<typeof JobPayload>;

/** What a finished job reports back through Redis: counts and timings, no values. */
export const JobOutcome = z.object({
  documents: z.number().int(),
  failed: z.number().int(),
  pages: z.number().int(),
  seconds: z.number(),
});
export type JobOutcome = z.infer<typeof JobOutcome>;
