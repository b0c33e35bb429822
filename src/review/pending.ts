import type { FieldStatus } from '../result/document.js';

/** Statuses that wait for a person: everything that is neither accepted nor already reviewed. */
export const PENDING_STATUSES: readonly FieldStatus[] = ['review', 'missing', 'invalid'];

export function isPending(status: FieldStatus): boolean {
  return PENDING_STATUSES.includes(status);
}
