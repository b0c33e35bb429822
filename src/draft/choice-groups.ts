import type { Detection } from '../detect/types.js';
import type { Phrase } from '../page/text-phrases.js';
import type { LabelSide } from './drafted-field.js';

/** A detected area with the phrase that labels it, before it becomes a drafted field. */
export interface Candidate {
  det: Detection;
  phrase: Phrase | null;
  side: LabelSide | null;
  far: boolean;
  /** OCR text of the phrase as read (before cleaning), or null. */
  text: string | null;
}

/**
 * Rows of checkboxes whose own labels sit to their right and whose row starts with a label ending in a colon
 * ("Species:  [ ] Dog  [ ] Cat") read as one choice question (common practice of form layout).
 */
export function checkboxGroups(cands: readonly Candidate[]): Candidate[][] {
  const boxes = cands.filter((c) => c.det.className === 'checkbox' && c.side === 'right').sort((a, b) => a.det.box.x - b.det.box.x);
  const rows: Candidate[][] = [];
  for (const c of boxes) {
    const cy = c.det.box.y + c.det.box.h / 2;
    const row = rows.find((r) => Math.abs(r[0].det.box.y + r[0].det.box.h / 2 - cy) <= 0.5 * c.det.box.h);
    if (row) row.push(c);
    else rows.push([c]);
  }
  return rows.filter((r) => r.length >= 2);
}

