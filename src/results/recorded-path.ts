import path from 'node:path';

/**
 * How a scanned file's path is written into records, results.jsonl, the journal and the audit log: relative to the
 * working folder, as a person would type it, never resolved to an absolute path. Scan folders are often named for
 * the people on the forms, and an absolute path also carries the account and folders above the work; those stay out
 * of the records. Inputs given relative to the working folder come back exactly as given (normalized).
 */
export function recordedPath(file: string, cwd: string = process.cwd()): string {
  const rel = path.relative(cwd, path.resolve(cwd, file));
  return rel === '' ? '.' : rel;
}
