import { okLine, writeBatchOutputs, type ResultsLine } from '../batch/sinks.js';
import type { DocumentResult } from '../result/document.js';

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
    return okLine(r);
  });
  return changed ? out : null;
}

/** Rewrite results.jsonl and summary.json (atomically, with the batch code's own writer) when counts moved. */
export async function refreshResultsFiles(dir: string, lines: readonly ResultsLine[], results: readonly DocumentResult[]): Promise<boolean> {
  const next = refreshedLines(lines, results);
  if (next === null) return false;
  await writeBatchOutputs(dir, next);
  return true;
}
