import type { LayoutField } from '../layout-model.js';
import type { Rng } from '../prng.js';
import { drawEmail, drawPhone } from './contact.js';
import { drawDate, isDateWindow } from './dates.js';
import { drawNumber } from './numbers.js';
import { drawPostalCode } from './postal-codes.js';
import {
  BOAT_MAKES, BOAT_NAMES, BREEDS, CITIES, CROPS, FAMILY_NAMES, GIVEN_NAMES, NOTE_SENTENCES, OCCUPATIONS, PET_NAMES, STREETS,
} from './word-lists.js';
import { US_STATES } from '../../fields/us-states.js';
import { applyCase, type TextOptions } from '../../fields/text.js';

/** The invented person filling one page, so that name and e-mail agree. */
export interface Persona {
  given: string;
  family: string;
}

export function drawPersona(rng: Rng): Persona {
  return { given: rng.pick(GIVEN_NAMES), family: rng.pick(FAMILY_NAMES) };
}

/** A drawn value: `value` normalized as results report it, `text` as written on the page. */
export interface DrawnValue {
  value: string | number;
  text: string;
}

const LETTERS = 'ABCDEFGHJKLMNPRSTUVWXYZ';

function textValue(rng: Rng, kind: string, p: Persona): string {
  switch (kind) {
    case 'first_name':
      return p.given;
    case 'last_name':
      return p.family;
    case 'full_name':
      return `${p.given} ${p.family}`;
    case 'other_name':
      return `${rng.pick(GIVEN_NAMES)} ${rng.pick(FAMILY_NAMES)}`;
    case 'pet_name':
      return rng.pick(PET_NAMES);
    case 'breed':
      return rng.pick(BREEDS);
    case 'street':
      return `${rng.int(2, 2999)} ${rng.pick(STREETS)}`;
    case 'city':
      return rng.pick(CITIES);
    case 'boat_name':
      return rng.pick(BOAT_NAMES);
    case 'boat_make':
      return rng.pick(BOAT_MAKES);
    case 'crops':
      return rng.shuffle(CROPS).slice(0, rng.int(1, 3)).join(', ');
    case 'occupation':
      return rng.pick(OCCUPATIONS);
    case 'notes':
      return rng.shuffle(NOTE_SENTENCES).slice(0, rng.int(1, 2)).join(' ');
    case 'plot_id':
      return `${rng.pick(['A', 'B', 'C', 'D', 'E'])}-${rng.int(1, 40)}`;
    case 'initials':
      return `${p.given[0]}${p.family[0]}`;
    case 'registration':
      // Two letters, four digits, two letters: the shape of US state boat numbers, with invented content.
      return `${rng.pick(US_STATES)}${rng.int(1000, 9999)}${rng.pick(LETTERS.split(''))}${rng.pick(LETTERS.split(''))}`;
    case 'member_id':
      return String(rng.int(100000, 999999));
    default:
      throw new Error(`unknown text value kind "${kind}"`);
  }
}

/** Draw a value for a text-like field (every type but checkbox, choice and signature). */
export function drawValue(rng: Rng, field: LayoutField, persona: Persona): DrawnValue {
  const o = field.options;
  switch (field.type) {
    case 'text': {
      // The text type's own case rule, so the truth is the value the field normalizes to.
      const text = applyCase(textValue(rng, field.valueKind, persona), o.case as TextOptions['case']);
      return { value: text, text };
    }
    case 'date': {
      const formats = (o.formats as string[] | undefined) ?? ['YYYY-MM-DD'];
      const window = isDateWindow(field.valueKind) ? field.valueKind : 'past';
      const d = drawDate(rng, window, formats[0]);
      return { value: d.iso, text: d.text };
    }
    case 'phone': {
      const p = drawPhone(rng);
      return { value: p.e164, text: p.text };
    }
    case 'email': {
      const e = field.valueKind === 'other_email' ? drawEmail(rng, rng.pick(GIVEN_NAMES), rng.pick(FAMILY_NAMES)) : drawEmail(rng, persona.given, persona.family);
      return { value: e, text: e };
    }
    case 'number': {
      const n = drawNumber(rng, field.valueKind, (o.decimalSeparator as '.' | ',' | undefined) ?? '.');
      return { value: n.value, text: n.text };
    }
    case 'postal_code': {
      const code = drawPostalCode(rng, (o.country as 'US' | 'CA' | 'GB' | undefined) ?? 'US');
      return { value: code, text: code };
    }
    case 'choice_text': {
      const choices = o.choices as string[];
      const value = rng.pick(choices);
      // People write a listed word in their own case; the field type maps it back to the listed spelling.
      const text = rng.chance(0.2) ? value.toLowerCase() : value;
      return { value, text };
    }
    default:
      throw new Error(`field type "${field.type}" is not written as text`);
  }
}

