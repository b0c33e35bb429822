import type { DraftedField } from './drafted-field.js';

/** Why a drafted field needs a person's look before the schema is used. */
export type UnsureReason = 'no_label' | 'weak_detection' | 'label_below' | 'label_far' | 'repeated_label';

export interface UnsureField {
  field: DraftedField;
  reasons: UnsureReason[];
}

/** What each reason asks the user to check, in plain words (printed by `schema draft`). */
export const UNSURE_TEXT: Record<UnsureReason, string> = {
  no_label: 'no printed label found: name it',
  weak_detection: 'weakly detected: is it an entry area?',
  label_below: 'named from the text below it: check the name',
  label_far: 'label printed far from it: check the name',
  repeated_label: 'label shared with another field: check the name',
};

/**
 * Detection scores under this are listed: a little above the shipped model's operating threshold (0.35,
 * models/README.md), where its precision is low (0.69 for checkboxes on synthetic pages, far lower on real blanks).
 * Our judgement, not fitted: a field listed needlessly costs the user a glance.
 */
const WEAK_SCORE = 0.5;

/** The drafted fields a person should check, with the reasons, in drafting order. */
export function unsureFields(fields: readonly DraftedField[]): UnsureField[] {
  const labels = new Map<string, number>();
  for (const f of fields) if (f.label) labels.set(f.label.toLowerCase(), (labels.get(f.label.toLowerCase()) ?? 0) + 1);
  const out: UnsureField[] = [];
  for (const f of fields) {
    const reasons: UnsureReason[] = [];
    if (!f.label) reasons.push('no_label');
    if (f.detectionScore < WEAK_SCORE) reasons.push('weak_detection');
    if (f.labelSide === 'below' && f.className !== 'signature_area') reasons.push('label_below');
    if (f.label && f.labelFar) reasons.push('label_far');
    if (f.label && (labels.get(f.label.toLowerCase()) ?? 0) > 1) reasons.push('repeated_label');
    if (reasons.length) out.push({ field: f, reasons });
  }
  return out;
}
