import type { FieldSource } from '../../draft/from-pdf/assemble.js';
import { DATE_PARTS } from '../../draft/from-pdf/guess-type.js';
import { lastNameWord, partialName, words } from '../../draft/from-pdf/naming.js';
import type { Rng } from '../prng.js';
import { drawEmail, drawPhone } from '../values/contact.js';
import { drawDate } from '../values/dates.js';
import type { Persona } from '../values/draw-value.js';
import { drawPostalCode, drawUsZip } from '../values/postal-codes.js';
import { CITIES, FAMILY_NAMES, GIVEN_NAMES, NOTE_SENTENCES, OCCUPATIONS, STREETS } from '../values/word-lists.js';

/** An invented value for a text-like field: `value` normalized as results report it, `text` as written. */
export interface PdfValue {
  value: string | number;
  text: string;
}

/** Invented organisation endings for fields asking for a committee, employer or bank. */
const ORG_ENDINGS = ['Civic Group', 'Services', 'Cooperative', 'Supply Co', 'Trust', 'Association'];

/** Average glyph advance as a share of the font size for the typed and handwriting fonts (measured in
 *  src/synth/text-metrics.ts tables: about 0.55 for DejaVu Sans). */
const CHAR_ADVANCE = 0.55;

/** The most characters a widget holds at the size text is written in it. */
export function capacity(boxW: number, boxH: number, maxLength?: number): number {
  const size = Math.min(boxH * 0.7, 34);
  const fit = Math.max(1, Math.floor((boxW - 6) / (size * CHAR_ADVANCE)));
  return maxLength ? Math.min(maxLength, fit) : fit;
}

/** Cut at a word boundary to at most `max` characters (a single long word is cut inside). */
export function fitText(text: string, max: number): string {
  if (text.length <= max) return text;
  const cut = text.slice(0, max + 1);
  const space = cut.lastIndexOf(' ');
  return (space > 0 ? cut.slice(0, space) : text.slice(0, max)).trim();
}

/** Digits that cannot be a real person's number: a leading 9 (never issued as a Social Security number; from
 *  memory of SSA's numbering rules) or an all-invented account number. */
function fakeDigits(rng: Rng, n: number): string {
  let s = '9';
  while (s.length < n) s += String(rng.int(0, 9));
  return s.slice(0, n);
}

/** Words naming a kind of entry; a name's last such word decides ("address city" is a city). */
const KIND_WORDS: [string, string[]][] = [
  ['street', ['street', 'address']],
  ['city', ['city', 'town']],
  ['country', ['country']],
  ['given', ['first', 'given']],
  ['family', ['last', 'family', 'surname']],
  ['middle', ['middle']],
  ['org', ['committee', 'employer', 'organization', 'business', 'company', 'bank', 'institution', 'creditor', 'agency']],
  ['full_name', ['name', 'payee', 'preparer', 'attorney', 'debtor', 'treasurer', 'spouse', 'claimant']],
  ['occupation', ['occupation', 'job', 'title', 'position']],
  ['digits', ['number', 'numbers', 'no', 'id', 'file', 'identification', 'case']],
];

/** The kind of entry a field's words ask for, or null when they say nothing about it. Identification numbers,
 *  initials and organisations win wherever they are named ("Social Security number, first three" is digits, "name
 *  of committee" an organisation). */
function valueKindOf(ws: readonly string[]): string | null {
  if (ws.some((w) => ['initial', 'mi'].includes(w))) return 'initial';
  if (ws.some((w) => ['ssn', 'social', 'security', 'itin', 'ein', 'tin', 'routing', 'account', 'zip', 'digits'].includes(w))) return 'digits';
  if (ws.some((w) => KIND_WORDS[6][1].includes(w))) return 'org';
  // "Last name", "Name (first)": the part of a name wins over the word "name".
  if (ws.includes('name')) for (const [kind, list] of KIND_WORDS.slice(3, 6)) if (ws.some((w) => list.includes(w))) return kind;
  for (let i = ws.length - 1; i >= 0; i--) {
    const hit = KIND_WORDS.find(([, list]) => list.includes(ws[i]));
    if (hit) return hit[0];
  }
  return null;
}

function textFor(rng: Rng, kind: string | null, p: Persona, cap: number): string {
  switch (kind ?? rng.pick(['full_name', 'street', 'city', 'occupation', 'digits'])) {
    case 'initial':
      return p.given[0];
    case 'digits':
      return fakeDigits(rng, Math.min(cap, kind === null ? rng.int(4, 9) : 9));
    case 'street':
      return `${rng.int(2, 2999)} ${rng.pick(STREETS)}`;
    case 'city':
      return rng.pick(CITIES);
    case 'country':
      return cap <= 3 ? 'US' : 'USA';
    case 'given':
      return p.given;
    case 'family':
      return p.family;
    case 'middle':
      return rng.pick(GIVEN_NAMES);
    case 'org':
      return `${rng.pick(FAMILY_NAMES)} ${rng.pick(ORG_ENDINGS)}`;
    case 'occupation':
      return rng.pick(OCCUPATIONS);
    default:
      return `${p.given} ${p.family}`;
  }
}

/**
 * Invent a value for one text-like field (text, comb, number, date, phone, e-mail, postal code, choice text) from
 * the project's invented word lists, sized to fit the widget and its maximum length.
 */
export function drawPdfValue(rng: Rng, src: FieldSource, persona: Persona): PdfValue {
  const f = src.field;
  const o = (f.options ?? {}) as Record<string, unknown>;
  const box = src.boxes[0];
  const w = src.widgets[0];
  const cap = capacity(box.w, box.h, w.maxLength);
  const nameWords = words(partialName(w.fieldName));
  const tipWords = words(w.tooltip);
  const ws = new Set([...nameWords, ...tipWords]);
  switch (f.type) {
    case 'date': {
      const d = drawDate(rng, ws.has('birth') || ws.has('dob') ? 'birth' : 'past', ((o.formats as string[] | undefined) ?? ['MM/DD/YYYY'])[0]);
      return { value: d.iso, text: d.text };
    }
    case 'phone': {
      // Written as drawn, or as its ten digits where that is too long; never cut short, so what the page shows is
      // the whole number the truth holds (a field too small for either stays blank: planFill).
      const p = drawPhone(rng);
      return { value: p.e164, text: cap >= p.text.length ? p.text : p.e164.slice(2) };
    }
    case 'email': {
      const e = drawEmail(rng, persona.given, persona.family);
      return { value: e, text: e };
    }
    case 'postal_code': {
      const code = cap >= 10 ? drawPostalCode(rng, 'US') : drawUsZip(rng, false);
      return { value: code, text: code };
    }
    case 'choice_text': {
      const value = rng.pick(o.choices as string[]);
      return { value, text: value };
    }
    case 'number': {
      if (o.integer) {
        const last = lastNameWord(w.fieldName);
        const kind = DATE_PARTS.includes(last) ? last : [...ws].find((x) => DATE_PARTS.includes(x)) ?? '';
        const n = ['month', 'mm', 'mo'].includes(kind) ? rng.int(1, 12) : ['day', 'dd'].includes(kind) ? rng.int(1, 28) : ['year', 'yyyy', 'yy', 'yr'].includes(kind) ? rng.int(1950, 2024) : rng.int(1, 99);
        const text = String(n).padStart(['month', 'mm', 'mo', 'day', 'dd'].includes(kind) ? 2 : 1, '0').slice(-(w.maxLength ?? 9));
        return { value: Number(text), text };
      }
      const digits = Math.max(1, Math.min(6, cap - 3));
      const value = Math.round(rng.range(1, 10 ** digits) * 100) / 100;
      return { value, text: value.toFixed(2) };
    }
    default: {
      const text = src.field.ocr?.mode === 'block' ? rng.pick(NOTE_SENTENCES) : textFor(rng, valueKindOf(nameWords) ?? valueKindOf(tipWords), persona, cap);
      const fitted = fitText(text, cap);
      return { value: fitted, text: fitted };
    }
  }
}
