import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import type { DocumentResult } from '../result/document.js';
import { FieldStatus } from '../result/document.js';

/** One line of DIR/results.jsonl: a processed document or a failed one. */
export const ResultsLine = z.object({
  document: z.string(),
  path: z.string(),
  ok: z.boolean(),
  error: z.string().optional(),
  /** File name of the document JSON inside the results folder. */
  json: z.string().optional(),
  sha256: z.string().optional(),
  schema: z.string().optional(),
  pages: z.number().int().optional(),
  counts: z.record(FieldStatus, z.number().int()).optional(),
  seconds: z.number().optional(),
});
export type ResultsLine = z.infer<typeof ResultsLine>;

export const RESULTS_FILE = 'results.jsonl';
export const SUMMARY_FILE = 'summary.json';

export function documentJsonName(documentId: string): string {
  return `${documentId}.json`;
}

export function okLine(result: DocumentResult): ResultsLine {
  return {
    document: result.document.id,
    path: result.document.path,
    ok: true,
    json: documentJsonName(result.document.id),
    sha256: result.document.sha256,
    schema: result.schema.name,
    pages: result.pages.length,
    counts: result.counts,
    seconds: result.seconds,
  };
}

export function failedLine(documentId: string, file: string, error: string): ResultsLine {
  return { document: documentId, path: file, ok: false, error };
}

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
  return {
    createdAt: new Date().toISOString(),
    documents: { total: lines.length, processed, failed: lines.length - processed },
    pages,
    fields: { total, byStatus },
    straightThroughRate: total > 0 ? byStatus.accepted / total : null,
    documentStraightThroughRate: processed > 0 ? lines.filter((l) => l.ok && allAccepted(l.counts)).length / processed : null,
    seconds: Math.round(seconds * 1000) / 1000,
    secondsPerPage: pages > 0 ? Math.round((seconds / pages) * 1000) / 1000 : null,
  };
}

/** Write results.jsonl and summary.json (atomically, each). */
export async function writeBatchOutputs(outDir: string, lines: readonly ResultsLine[]): Promise<BatchSummary> {
  const summary = summarize(lines);
  await writeFileAtomic(path.join(outDir, RESULTS_FILE), lines.map((l) => JSON.stringify(l)).join('\n') + (lines.length ? '\n' : ''));
  await writeJsonAtomic(path.join(outDir, SUMMARY_FILE), summary);
  return summary;
}

export async function readResultsLines(outDir: string): Promise<ResultsLine[]> {
  const file = path.join(outDir, RESULTS_FILE);
  const text = await readFile(file, 'utf8');
  return text
    .split('\n')
    .filter((l) => l.trim() !== '')
    .map((l, i) => {
      const parsed = ResultsLine.safeParse(JSON.parse(l));
      if (!parsed.success) throw new Error(`${file}: line ${i + 1} is not a results line`);
      return parsed.data;
    });
}
