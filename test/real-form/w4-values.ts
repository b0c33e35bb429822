import type { MarkKind } from '../../src/synth/checkbox-mark.js';
import { isChecked } from '../../src/synth/checkbox-mark.js';
import type { FieldFill, FieldValue, FillMode } from '../../src/synth/fill.js';
import { blankValue } from '../../src/synth/fill.js';
import type { Layout, LayoutField } from '../../src/synth/layout-model.js';
import type { Rng } from '../../src/synth/prng.js';
import { drawDate } from '../../src/synth/values/dates.js';
import { drawUsZip } from '../../src/synth/values/postal-codes.js';
import { US_STATES } from '../../src/fields/us-states.js';
import { CITIES, FAMILY_NAMES, GIVEN_NAMES, STREETS } from '../../src/synth/values/word-lists.js';

/**
 * Invented entries for the real withholding-certificate layout: a made-up employee from the project's invented word
 * lists, identification numbers from ranges that are never issued to anyone, amounts consistent with the form's
 * arithmetic. Nothing here describes a real person or business.
 */

/** Kinds of invented business for the employer line (generic trades, no names of real firms). */
const TRADES = ['Bakery', 'Boatworks', 'Garden Supply', 'Print Shop', 'Bike Repair', 'Ferry Co.', 'Tool Library', 'Orchard'];

/** Group digits the en-US way ("4,000"), as people write amounts on US forms (CLDR en-US number symbols, via Intl). */
const usAmount = new Intl.NumberFormat('en-US', { maximumFractionDigits: 2, minimumFractionDigits: 0 });

/**
 * Numbers 987-65-4320 .. 987-65-4329 are set aside by the US Social Security Administration for use in
 * advertisements and examples and are never issued (from memory of SSA guidance).
 */
function exampleSsn(rng: Rng): string {
  return `987-65-432${rng.int(0, 9)}`;
}

/** Employer numbers with the prefix 00, which the IRS does not assign (from memory of the published prefix list). */
function exampleEin(rng: Rng): string {
  return `00-${String(rng.int(0, 9_999_999)).padStart(7, '0')}`;
}

interface TextEntry {
  value: FieldValue;
  text: string;
}

const written = (text: string): TextEntry => ({ value: text, text });
const amount = (v: number, text = usAmount.format(v)): TextEntry => ({ value: v, text });

/** Steps 3 and 4: each amount written or left empty; line 3 is the sum of the two lines above it. */
function amounts(rng: Rng): Record<string, TextEntry | null> {
  const children = rng.weighted([[0, 40], [1, 25], [2, 25], [3, 10]] as const);
  const others = rng.weighted([[0, 70], [1, 20], [2, 10]] as const);
  const out: Record<string, TextEntry | null> = {};
  out.qualifying_children_amount = children ? amount(children * 2000) : null;
  out.other_dependents_amount = others ? amount(others * 500) : null;
  out.credits_total = children + others ? amount(children * 2000 + others * 500) : null;
  out.other_income = rng.chance(0.4) ? amount(rng.int(1, 80) * 250) : null;
  out.deductions = rng.chance(0.35) ? amount(rng.int(2, 60) * 150) : null;
  if (rng.chance(0.4)) {
    const v = rng.int(1, 30) * 5;
    // Some people write the cents too.
    out.extra_withholding = rng.chance(0.3) ? amount(v, `${v}.00`) : amount(v);
  } else out.extra_withholding = null;
  return out;
}

function textEntries(rng: Rng): Record<string, TextEntry | null> {
  const given = rng.pick(GIVEN_NAMES);
  const initial = rng.pick('ABCDEFGHJKLMNPRSTW'.split(''));
  const city = rng.pick(CITIES);
  const employerCity = rng.pick(CITIES);
  return {
    first_name: written(rng.chance(0.6) ? `${given} ${initial}.` : given),
    last_name: written(rng.pick(FAMILY_NAMES)),
    ssn: written(exampleSsn(rng)),
    address: written(`${rng.int(2, 2999)} ${rng.pick(STREETS)}${rng.chance(0.25) ? ` Apt ${rng.int(1, 40)}` : ''}`),
    city_state_zip: written(`${city}, ${rng.pick(US_STATES)} ${drawUsZip(rng, false)}`),
    ...amounts(rng.fork('amounts')),
    signature_date: rng.chance(0.97) ? dated(rng, 'past') : null,
    employer_name_address: rng.chance(0.9)
      ? written(`${employerCity} ${rng.pick(TRADES)}, ${rng.int(2, 999)} ${rng.pick(STREETS)}`)
      : null,
    first_date_of_employment: rng.chance(0.9) ? dated(rng, 'past') : null,
    employer_ein: rng.chance(0.9) ? written(exampleEin(rng)) : null,
  };
}

function dated(rng: Rng, window: 'past'): TextEntry {
  const d = drawDate(rng, window, 'MM/DD/YYYY');
  return { value: d.iso, text: d.text };
}

function checkedMark(rng: Rng): MarkKind {
  return rng.weighted([['tick', 40], ['cross', 30], ['fill', 15], ['scribble', 15]] as const);
}

/**
 * What the writer puts in each field of the W-4 layout. Only one filing status is ticked (the form asks for one);
 * the two-jobs box is ticked on a quarter of pages; the employee always signs.
 */
export function fillW4(layout: Layout, mode: FillMode, rng: Rng): FieldFill[] {
  const texts = textEntries(rng.fork('text'));
  return layout.fields.map((field: LayoutField): FieldFill => {
    const own = rng.fork(`field:${field.name}`);
    if (mode === 'blank') {
      const marks = field.type === 'checkbox' || field.type === 'choice' ? field.slots.map((): MarkKind => 'empty') : undefined;
      return { field, value: blankValue(field.type, field.options), text: null, marks, signed: field.type === 'signature' ? false : undefined };
    }
    switch (field.type) {
      case 'choice': {
        const k = own.int(0, field.slots.length - 1);
        const marks = field.slots.map((_, i): MarkKind => (i === k ? checkedMark(own) : 'empty'));
        return { field, value: field.slots[k].key, text: null, marks };
      }
      case 'checkbox': {
        const mark: MarkKind = own.chance(0.25) ? checkedMark(own) : 'empty';
        return { field, value: isChecked(mark), text: null, marks: [mark] };
      }
      case 'signature':
        return { field, value: true, text: null, signed: true };
      default: {
        if (!(field.name in texts)) throw new Error(`no invented value for W-4 field ${field.name}`);
        const t = texts[field.name];
        return t ? { field, value: t.value, text: t.text } : { field, value: null, text: null };
      }
    }
  });
}
