import type { FieldSource } from '../../draft/from-pdf/assemble.js';
import { isChecked, type MarkKind } from '../checkbox-mark.js';
import { checkedMark, uncheckedMark, type FieldValue } from '../fill.js';
import type { Rng } from '../prng.js';
import { drawPersona } from '../values/draw-value.js';
import { drawPdfValue } from './values.js';

/** What one field of a filled page holds. */
export interface PdfFieldFill {
  src: FieldSource;
  /** Normalized as results report it; null (false for checkbox and signature) when left blank. */
  value: FieldValue;
  /** As written; null for marks, signatures and blank fields. */
  text: string | null;
  /** Checkbox: one mark; choice: one per option box. */
  marks?: MarkKind[];
}

/** Share of fields a filled page leaves empty (common practice: people skip what does not apply to them). */
const SKIP = 0.12;
/** Share of checkboxes ticked: most boxes on a long form do not apply (common practice). */
const TICKED = 0.4;

/** Decide every field's content for one page; each field draws from its own stream. */
export function planFill(sources: readonly FieldSource[], rng: Rng): PdfFieldFill[] {
  const persona = drawPersona(rng.fork('persona'));
  return sources.map((src) => {
    const r = rng.fork(`field:${src.field.name}`);
    const skip = r.chance(SKIP);
    switch (src.kind) {
      case 'checkbox': {
        const mark = !skip && r.chance(TICKED) ? checkedMark(r) : uncheckedMark(r);
        return { src, value: isChecked(mark), text: null, marks: [mark] };
      }
      case 'choice': {
        const k = skip ? -1 : r.int(0, src.boxes.length - 1);
        const marks = src.boxes.map((_, i) => (i === k ? checkedMark(r) : uncheckedMark(r)));
        return { src, value: k < 0 ? null : src.values![k], text: null, marks };
      }
      case 'signature':
        return { src, value: !skip, text: null };
      default: {
        if (skip) return { src, value: src.field.type === 'signature' ? false : null, text: null };
        if (src.field.type === 'signature') return { src, value: true, text: null };
        const v = drawPdfValue(r, src, persona);
        // A value that does not fit the field's maximum length cannot be typed into it: the field stays blank.
        const max = src.widgets[0].maxLength;
        if (max !== undefined && v.text.length > max) return { src, value: null, text: null };
        return { src, value: v.value, text: v.text };
      }
    }
  });
}
