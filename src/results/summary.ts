import { FieldStatus } from '../result/document.js';
import type { ResultsLine } from './results-line.js';
import { isFailed } from './results-line.js';

export interface BatchSummary {
  createdAt: string;
  documents: { total: number; processed: number; failed: number };
  pages: number;
  fields: { total: number; byStatus: Record<FieldStatus, number> };
  /** Share of fields accepted without review. */
  straightThroughRate: number | null;
  /** Share of processed documents with every field accepted: nobody had to look at them (what offices count). */
  documentStraightThroughRate: number | null;
  seconds: number;
  secondsPerPage: number | null;
  /** Inputs found but not tried, each with its reason. */
  skipped: { path: string; reason: string }[];
}

function allAccepted(counts: ResultsLine['counts']): boolean {
  return FieldStatus.options.every((s) => s === 'accepted' || (counts?.[s] ?? 0) === 0);
}

export function summarize(lines: readonly ResultsLine[]): BatchSummary {
  const byStatus = Object.fromEntries(FieldStatus.options.map((s) => [s, 0])) as Record<FieldStatus, number>;
  let pages = 0;
  let seconds = 0;
  for (const l of lines) {
    if (!l.ok) continue;
    pages += l.pages ?? 0;
    seconds += l.seconds ?? 0;
    for (const s of FieldStatus.options) byStatus[s] += l.counts?.[s] ?? 0;
  }
  const total = Object.values(byStatus).reduce((a, b) => a + b, 0);
  const processed = lines.filter((l) => l.ok).length;
  const failed = lines.filter(isFailed).length;
  const skipped = lines.filter((l) => l.skipped !== undefined).map((l) => ({ path: l.path, reason: l.skipped as string }));
  return {
    createdAt: new Date().toISOString(),
    documents: { total: processed + failed, processed, failed },
    pages,
    fields: { total, byStatus },
    straightThroughRate: total > 0 ? byStatus.accepted / total : null,
    documentStraightThroughRate: processed > 0 ? lines.filter((l) => l.ok && allAccepted(l.counts)).length / processed : null,
    seconds: Math.round(seconds * 1000) / 1000,
    secondsPerPage: pages > 0 ? Math.round((seconds / pages) * 1000) / 1000 : null,
    skipped,
  };
}
