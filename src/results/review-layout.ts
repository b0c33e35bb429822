import path from 'node:path';

/** Where review artefacts live inside a results folder. */
export const REVIEW_DIR = 'review';
export const QUEUE_FILE = 'queue.csv';
export const AUDIT_FILE = 'audit.jsonl';
export const CROPS_DIR = 'crops';

export function reviewDir(resultsDir: string): string {
  return path.join(resultsDir, REVIEW_DIR);
}

export function queuePath(resultsDir: string): string {
  return path.join(resultsDir, REVIEW_DIR, QUEUE_FILE);
}

export function auditPath(resultsDir: string): string {
  return path.join(resultsDir, REVIEW_DIR, AUDIT_FILE);
}

/** Crop file names, relative to the review folder (so relative to queue.csv, as the queue lists them). */
export function cropName(rowId: string): string {
  return `${CROPS_DIR}/${rowId}.png`;
}

export function contextCropName(rowId: string): string {
  return `${CROPS_DIR}/${rowId}.context.png`;
}
