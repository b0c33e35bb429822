import type { FontKey } from '../image/fonts.js';
import type { FieldTypeName, Layout, LayoutField } from './layout-model.js';
import { isChecked, type MarkKind } from './checkbox-mark.js';
import type { Rng } from './prng.js';
import { drawPersona, drawValue } from './values/draw-value.js';
import type { TruthFill } from '../result/truth.js';

/** How a page is filled: the truth file's fill (result/truth.ts). */
export type FillMode = TruthFill;

/** How the page's writer writes: one pen per page, as one person fills one form. */
export interface Pen {
  font: FontKey;
  /** Gray level of the ink, 0 = black. */
  ink: number;
  /** Share of the write box's height the letters take. */
  size: number;
  handwriting: boolean;
  /** Digits in comb cells are real handwriting from the MNIST test split (handwritten-digits.ts), not a font. */
  realDigits?: boolean;
}

export type FieldValue = string | number | boolean | string[] | null;

export interface FieldFill {
  field: LayoutField;
  /** Normalized value, as results report it. */
  value: FieldValue;
  /** What is written on the page; null for marks, signatures and blank fields. */
  text: string | null;
  /** One mark per slot, for checkbox and choice fields. */
  marks?: MarkKind[];
  signed?: boolean;
}

export function drawPen(rng: Rng, mode: FillMode): Pen {
  if (mode === 'handwriting') {
    return { font: rng.pick(['caveat', 'pen'] as const), ink: rng.int(15, 90), size: rng.range(0.7, 0.85), handwriting: true };
  }
  return { font: rng.pick(['sans', 'serif', 'mono'] as const), ink: rng.int(0, 40), size: rng.range(0.48, 0.6), handwriting: false };
}

/** Share of fields a filled page leaves empty (common practice: optional fields are often skipped). */
const SKIP_OPTIONAL = 0.1;
const SKIP_REQUIRED = 0.02;

/** A deliberate mark, in the mix people use (common practice): ticks and crosses most, fills and faint marks less. */
export function checkedMark(rng: Rng): MarkKind {
  return rng.weighted([['tick', 35], ['cross', 25], ['fill', 15], ['scribble', 10], ['light', 15]] as const);
}

/** An unticked box: mostly empty, sometimes a stray pen touch. */
export function uncheckedMark(rng: Rng): MarkKind {
  return rng.chance(0.1) ? 'dot' : 'empty';
}

/** The value a blank field reports. */
export function blankValue(type: FieldTypeName, options: Record<string, unknown>): FieldValue {
  if (type === 'checkbox' || type === 'signature') return false;
  if (type === 'choice') return options.multiple ? [] : null;
  return null;
}

function fillField(rng: Rng, field: LayoutField, mode: FillMode, persona: ReturnType<typeof drawPersona>): FieldFill {
  const skip = mode === 'blank' || rng.chance(field.required ? SKIP_REQUIRED : SKIP_OPTIONAL);
  switch (field.type) {
    case 'checkbox': {
      const mark = skip ? 'empty' : rng.chance(0.45) ? checkedMark(rng) : uncheckedMark(rng);
      return { field, value: isChecked(mark), text: null, marks: [mark] };
    }
    case 'choice': {
      const multiple = Boolean(field.options.multiple);
      const n = field.slots.length;
      let chosen: boolean[];
      if (skip) chosen = new Array(n).fill(false);
      else if (multiple) chosen = field.slots.map(() => rng.chance(0.4));
      else {
        const k = rng.int(0, n - 1);
        chosen = field.slots.map((_, i) => i === k);
      }
      const marks = chosen.map((c) => (c ? checkedMark(rng) : skip ? 'empty' : uncheckedMark(rng)));
      const keys = field.slots.filter((_, i) => chosen[i]).map((s) => s.key);
      return { field, value: multiple ? keys : (keys[0] ?? null), text: null, marks };
    }
    case 'signature':
      return { field, value: !skip, text: null, signed: !skip };
    default: {
      if (skip) return { field, value: null, text: null };
      const v = drawValue(rng, field, persona);
      return { field, value: v.value, text: v.text };
    }
  }
}

/** Decide what every field of the layout holds. Each field draws from its own stream so fills stay stable when
 *  other fields change. */
export function fillLayout(layout: Layout, mode: FillMode, rng: Rng): FieldFill[] {
  const persona = drawPersona(rng.fork('persona'));
  return layout.fields.map((f) => fillField(rng.fork(`field:${f.name}`), f, mode, persona));
}
