import type { DocumentResult } from '../result/document.js';
import { writeIndex } from '../results/index-write.js';
import { okLine, withRequestedId, type ResultsLine } from '../results/results-line.js';

function sameCounts(a: ResultsLine['counts'], b: DocumentResult['counts']): boolean {
  return JSON.stringify(a ?? {}) === JSON.stringify(b);
}

/**
 * results.jsonl lines refreshed from the current document results: a processed document whose counts differ
 * from its line gets a new line; failed documents and unchanged lines stay as they are. Returns null when
 * nothing differs, so that a run that changed nothing writes nothing.
 */
export function refreshedLines(lines: readonly ResultsLine[], results: readonly DocumentResult[]): ResultsLine[] | null {
  const byId = new Map(results.map((r) => [r.document.id, r]));
  let changed = false;
  const out = lines.map((l) => {
    const r = l.ok ? byId.get(l.document) : undefined;
    if (!r || sameCounts(l.counts, r.counts)) return l;
    changed = true;
    return withRequestedId(okLine(r), l.requestedId);
  });
  return changed ? out : null;
}

/**
 * Rewrite results.jsonl and summary.json (atomically, with the results folder's own writer) when counts moved, or
 * when the index read was rebuilt or came partly from a journal (`force`).
 */
export async function refreshResultsFiles(dir: string, lines: readonly ResultsLine[], results: readonly DocumentResult[], force = false): Promise<boolean> {
  const next = refreshedLines(lines, results) ?? (force ? [...lines] : null);
  if (next === null) return false;
  await writeIndex(dir, next);
  return true;
}
