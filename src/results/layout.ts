/** Names of the files a results folder holds at its top level (the review folder has its own: review-layout.ts). */
export const RESULTS_FILE = 'results.jsonl';
export const SUMMARY_FILE = 'summary.json';
/**
 * Lines appended while a run goes, one per document, so that a run cut off (killed, power lost) leaves its finished
 * documents listed: every reader replays it on top of results.jsonl, and the run that completes folds it in.
 */
export const JOURNAL_FILE = 'results.journal.jsonl';

/** Document ids that would clash with the folder's own files once ".json" is added. */
const RESERVED_IDS = new Set(['results', 'summary', 'results.journal']);

export function documentJsonName(documentId: string): string {
  return `${documentId}.json`;
}

export function isReservedId(id: string): boolean {
  return RESERVED_IDS.has(id.toLowerCase());
}

/**
 * Per-input outcome files that queue workers write (src/results/input-outcome.ts), one per input, merged into the
 * index by `queue collect`.
 */
export const OUTCOMES_DIR = 'outcomes';
