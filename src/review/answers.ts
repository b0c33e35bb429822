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

/**
 * Longest text a reviewer's cell is taken with. The largest free-text areas of the demo forms (a clinic's notes box)
 * hold a few hundred handwritten characters; 1 000 leaves room, 4 000 for a note. Longer cells are a paste gone wrong,
 * not an answer, and would be stored into every record and the audit log as given.
 */
export const MAX_CORRECTION_CHARS = 1000;
export const MAX_NOTE_CHARS = 4000;

/** Control characters (C0 but tab and line breaks, DEL, C1): never typed on a form, and NUL breaks many readers. */
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;

/** Why a reviewer's cell cannot be taken (too long, holds a control character), or null. Never quotes the cell. */
export function typedCellProblem(column: 'correction' | 'note', cell: string): string | null {
  const max = column === 'correction' ? MAX_CORRECTION_CHARS : MAX_NOTE_CHARS;
  if (cell.length > max) return `${column} is ${cell.length} characters long, over the ${max}-character limit; not applied`;
  const m = CONTROL.exec(cell);
  if (m) return `${column} holds a control character (U+${m[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}); not applied`;
  return null;
}
