/**
 * How a reviewer's cells are read. Words a person may type to confirm a value: yes in a few spellings, a tick,
 * an x (common practice in paper and spreadsheet checklists); an empty cell or a no means "not confirmed".
 */
const CONFIRM_WORDS = new Set(['yes', 'y', 'x', 'true', '1', 'ok', '\u2713', '\u2714']);
const NOT_CONFIRMED_WORDS = new Set(['', 'no', 'n', 'false', '0']);

/** A correction cell holding exactly this means "the field is empty on the form" (an empty cell means no correction). */
export const EMPTY_CORRECTION = '(empty)';

export type ConfirmAnswer = 'confirmed' | 'not_confirmed' | 'unreadable';

export function readConfirm(cell: string | undefined): ConfirmAnswer {
  const w = (cell ?? '').trim().toLowerCase();
  if (CONFIRM_WORDS.has(w)) return 'confirmed';
  if (NOT_CONFIRMED_WORDS.has(w)) return 'not_confirmed';
  return 'unreadable';
}

export function isEmptyCorrection(cell: string): boolean {
  return cell.trim().toLowerCase() === EMPTY_CORRECTION;
}
