import { z } from 'zod';
import type { DocumentResult } from '../result/document.js';
import { FieldStatus } from '../result/document.js';
import { documentJsonName } from './layout.js';

/** One line of DIR/results.jsonl: a processed document, a failed one, or an input that was skipped. */
export const ResultsLine = z.object({
  document: z.string(),
  path: z.string(),
  ok: z.boolean(),
  error: z.string().optional(),
  /** Why an input found in a folder was not tried (hidden, unsupported format, formglean's own output, ...). */
  skipped: z.string().optional(),
  /** The id the document would have had when another document already held it (the id got a suffix). */
  requestedId: z.string().optional(),
  /** File name of the document JSON inside the results folder. */
  json: z.string().optional(),
  sha256: z.string().optional(),
  schema: z.string().optional(),
  pages: z.number().int().optional(),
  counts: z.record(FieldStatus, z.number().int()).optional(),
  seconds: z.number().optional(),
  /** Set when the document fits none of the schemas (its record's layout status): it waits for a person as a whole. */
  unknownLayout: z.literal(true).optional(),
});
export type ResultsLine = z.infer<typeof ResultsLine>;

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
    ...(result.layout?.status === 'unknown_layout' ? { unknownLayout: true as const } : {}),
  };
}

/** The line, noting the id the document asked for when it got another (see src/batch/id-claims.ts). */
export function withRequestedId(line: ResultsLine, requestedId: string | undefined): ResultsLine {
  return requestedId === undefined || requestedId === line.document ? line : { ...line, requestedId };
}

export function failedLine(documentId: string, file: string, error: string): ResultsLine {
  return { document: documentId, path: file, ok: false, error };
}

export function skippedLine(file: string, reason: string): ResultsLine {
  return { document: '', path: file, ok: false, skipped: reason };
}

/** A line for a document that was tried and failed (a skipped input is not a failure). */
export function isFailed(line: ResultsLine): boolean {
  return !line.ok && line.skipped === undefined;
}
