import { userInfo } from 'node:os';
import { writeJsonAtomic } from '../io/atomic-write.js';
import type { DocumentResult, FieldResult } from '../result/document.js';
import { DocumentResult as DocumentResultSchema } from '../result/document.js';
import { withApplyLock } from './apply-lock.js';
import type { Answer, RowProblem } from './apply-plan.js';
import { answersFromQueue, planApply, type FieldUpdate } from './apply-plan.js';
import type { AuditEntry } from './audit.js';
import { appendAudit, readAudit } from './audit.js';
import type { FieldTyping } from './field-options.js';
import { FieldOptionsSource } from './field-options.js';
import { auditPath, reviewDir } from '../results/review-layout.js';
import { readReviewQueue } from './queue-read.js';
import { recordedPath } from '../results/recorded-path.js';
import { removeOrphanTemps } from '../results/temp-files.js';
import { refreshResultsFiles } from './results-refresh.js';
import { readResultsFolder, type StoredResult } from './result-store.js';
import { updatesByDocument, recoveredEntries } from './apply-audit.js';
import { applyUpdates } from './update-document.js';

export interface ApplyOptions {
  /** Who reviewed; default: FORMGLEAN_REVIEWER, then USER, then the login name. */
  reviewer?: string;
  /** Time stamped on the changes; default now. */
  now?: Date;
}

export interface ApplyReport {
  corrected: number;
  confirmed: number;
  /** Answers undone on the review page. */
  reverted: number;
  alreadyApplied: number;
  unanswered: number;
  documentsWritten: number;
  /** Audit entries written late for changes a cut-off earlier run made but did not log. */
  auditRecovered: number;
  problems: RowProblem[];
  /** Schema files that changed since extraction (corrections were checked with the current file). */
  changedSchemas: string[];
  /** Spreadsheet columns in the queue that formglean does not define (ignored). */
  extraColumns: string[];
}

export function defaultReviewer(env: NodeJS.ProcessEnv = process.env): string {
  const fromEnv = env.FORMGLEAN_REVIEWER?.trim() || env.USER?.trim();
  if (fromEnv) return fromEnv;
  try {
    return userInfo().username || 'unknown';
  } catch {
    return 'unknown';
  }
}

/** Field typings for every (schema, field) pair the documents use, so planning can stay synchronous. */
async function typingsFor(source: FieldOptionsSource, docs: readonly StoredResult[]): Promise<(doc: DocumentResult, f: FieldResult) => FieldTyping> {
  const cache = new Map<string, FieldTyping>();
  const key = (doc: DocumentResult, f: FieldResult) => `${doc.schema.path}\0${f.name}\0${f.type}`;
  for (const { result } of docs) {
    for (const f of result.fields) {
      const k = key(result, f);
      if (!cache.has(k)) cache.set(k, await source.typing(result, f.name, f.type));
    }
  }
  return (doc, f) => cache.get(key(doc, f)) ?? { error: `field "${f.name}": no schema options` };
}

/** Where answers come from: the queue file they answer (recorded in the audit log) and how they were given. */
export interface AnswerSource {
  queue: string;
  via: 'queue' | 'page';
}

export type AnswersReport = Omit<ApplyReport, 'extraColumns'> & {
  /** The documents as they are after the answers (for callers that show them, like the review page). */
  documents: StoredResult[];
};

/**
 * Apply answers to the results folder: the one path every answer takes, from a CSV queue or from the review page.
 * Every document JSON that gets an answer is rewritten atomically, then the audit log, then results.jsonl and
 * summary.json. Each write is atomic; a run cut off between writes is completed by running it again (documents
 * already holding their answer are left alone, missing audit lines are written from the documents' review blocks).
 * Answering again what a document already holds writes nothing.
 */
export async function applyAnswers(
  resultsDir: string,
  answers: readonly Answer[],
  source: AnswerSource,
  options: ApplyOptions = {},
): Promise<AnswersReport> {
  return withApplyLock(reviewDir(resultsDir), async () => {
    await removeOrphanTemps(resultsDir);
    const folder = await readResultsFolder(resultsDir);
    const fieldOptions = new FieldOptionsSource(resultsDir);
    const typing = await typingsFor(fieldOptions, folder.documents);
    const plan = planApply({
      answers,
      documents: folder.documents,
      typing,
      reviewer: options.reviewer?.trim() || defaultReviewer(),
      at: (options.now ?? new Date()).toISOString(),
      today: options.now ?? new Date(),
      queue: source.queue,
      via: source.via,
      resultsDir,
    });

    const current = new Map(folder.documents.map((d) => [d.result.document.id, d]));
    const grouped = updatesByDocument(plan.updates);
    for (const [docId, updates] of grouped) {
      const stored = current.get(docId)!;
      const raw = applyUpdates(stored.raw, updates);
      await writeJsonAtomic(stored.file, raw);
      current.set(docId, { ...stored, raw, result: DocumentResultSchema.parse(raw) });
    }

    const audit = auditPath(resultsDir);
    const recovered = recoveredEntries(plan.alreadyApplied, current, await readAudit(audit), source.queue);
    await appendAudit(audit, [...plan.updates.map((u: FieldUpdate) => u.entry), ...recovered]);
    const results = [...current.values()].map((d) => d.result);
    await refreshResultsFiles(resultsDir, folder.lines, results, folder.needsWrite);

    const documents = folder.documents.map((d) => d.result);
    return {
      corrected: plan.updates.filter((u) => u.entry.action === 'corrected').length,
      confirmed: plan.updates.filter((u) => u.entry.action === 'confirmed').length,
      reverted: plan.updates.filter((u) => u.entry.action === 'reverted').length,
      alreadyApplied: plan.alreadyApplied.length,
      unanswered: plan.unanswered,
      documentsWritten: grouped.size,
      auditRecovered: recovered.length,
      problems: plan.problems,
      changedSchemas: await fieldOptions.changedSchemas(documents),
      documents: [...current.values()],
    };
  });
}

/** Apply a reviewed CSV queue: its answered rows go through applyAnswers; unreadable rows are reported by line. */
export async function applyReviewQueue(queueFile: string, resultsDir: string, options: ApplyOptions = {}): Promise<ApplyReport> {
  const queue = await readReviewQueue(queueFile);
  const read = answersFromQueue(queue.entries);
  const { documents: _documents, ...report } = await applyAnswers(resultsDir, read.answers, { queue: recordedPath(queueFile), via: 'queue' }, options);
  return {
    ...report,
    unanswered: read.unanswered,
    problems: [...read.problems, ...report.problems].sort((a, b) => a.line - b.line),
    extraColumns: queue.extraColumns,
  };
}

export type { AuditEntry };
