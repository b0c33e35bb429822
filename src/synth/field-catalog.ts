import type { CheckSpec, ChoiceSpec, ItemSpec, TableColumn } from './layout-builder.js';
import type { Rng } from './prng.js';
import { US_STATES } from '../fields/us-states.js';

/** Printed date formats and, for each, how a form with printed separators splits it. */
export const DATE_FORMATS: readonly { format: string; parts?: number[]; separator?: string }[] = [
  { format: 'MM/DD/YYYY', parts: [2, 2, 4], separator: '/' },
  { format: 'DD.MM.YYYY', parts: [2, 2, 4], separator: '.' },
  { format: 'YYYY-MM-DD', parts: [4, 2, 2], separator: '-' },
  { format: 'D MMM YYYY' },
  { format: 'M/D/YYYY' },
];

type Template = Omit<ItemSpec, 'name' | 'span'> & { base: string };

/** Field templates for randomized training layouts: label, type, options and the kind of invented value. */
function templates(rng: Rng): Template[] {
  const date = rng.pick(DATE_FORMATS);
  const dateEntry = date.parts && rng.chance(0.35) ? { entry: 'parts' as const, parts: date.parts, separator: date.separator } : {};
  const dateOptions = { formats: [date.format] };
  return [
    { base: 'last_name', label: rng.pick(['Last name', 'Surname', 'Family name']), type: 'text', valueKind: 'last_name' },
    { base: 'first_name', label: rng.pick(['First name', 'Given name']), type: 'text', valueKind: 'first_name' },
    { base: 'full_name', label: rng.pick(['Name', 'Full name', 'Applicant name', 'Print name']), type: 'text', valueKind: 'full_name' },
    { base: 'street', label: rng.pick(['Street address', 'Address', 'Mailing address']), type: 'text', valueKind: 'street' },
    { base: 'city', label: rng.pick(['City', 'Town', 'City / Town']), type: 'text', valueKind: 'city' },
    { base: 'occupation', label: 'Occupation', type: 'text', valueKind: 'occupation' },
    { base: 'pet_name', label: "Pet's name", type: 'text', valueKind: 'pet_name' },
    { base: 'boat_name', label: 'Vessel name', type: 'text', valueKind: 'boat_name' },
    { base: 'plot', label: 'Plot no.', type: 'text', valueKind: 'plot_id' },
    { base: 'member_no', label: 'Member no.', type: 'text', valueKind: 'member_id', options: { pattern: '^[0-9]{6}$' }, entry: 'comb', cells: 6 },
    { base: 'registration', label: 'Registration no.', type: 'text', valueKind: 'registration', options: { case: 'upper' }, entry: 'comb', cells: rng.int(8, 10) },
    { base: 'initials', label: 'Initials', type: 'text', valueKind: 'initials', options: { case: 'upper' }, entry: 'comb', cells: 3 },
    { base: 'birth_date', label: rng.pick(['Date of birth', 'Birth date', 'DOB']), type: 'date', valueKind: 'birth', options: { ...dateOptions, notFuture: true }, ...dateEntry },
    { base: 'date', label: rng.pick(['Date', "Today's date", 'Date signed']), type: 'date', valueKind: 'past', options: dateOptions, ...dateEntry },
    { base: 'start_date', label: rng.pick(['Start date', 'Arrival date', 'Preferred start']), type: 'date', valueKind: 'upcoming', options: dateOptions },
    { base: 'phone', label: rng.pick(['Phone', 'Telephone', 'Daytime phone', 'Mobile']), type: 'phone', valueKind: 'phone', options: { defaultRegion: 'US' } },
    { base: 'email', label: rng.pick(['E-mail', 'Email address', 'E-mail address']), type: 'email', valueKind: 'email' },
    { base: 'weight', label: 'Weight (kg)', type: 'number', valueKind: 'weight_kg', options: { decimalSeparator: '.', unit: 'kg', min: 0 } },
    { base: 'length', label: 'Length (ft)', type: 'number', valueKind: 'boat_length_ft', options: { integer: true, decimalSeparator: '.', unit: 'ft' } },
    { base: 'household', label: 'Household size', type: 'number', valueKind: 'household', options: { integer: true, decimalSeparator: '.', min: 1 } },
    { base: 'amount', label: 'Amount paid ($)', type: 'number', valueKind: 'amount', options: { decimalSeparator: '.', min: 0 } },
    { base: 'zip', label: rng.pick(['ZIP', 'ZIP code']), type: 'postal_code', valueKind: 'postal_code', options: { country: 'US' }, ...(rng.chance(0.3) ? { entry: 'comb' as const, cells: 5 } : {}) },
    { base: 'postal_code', label: 'Postal code', type: 'postal_code', valueKind: 'postal_code', options: { country: 'CA' } },
    { base: 'postcode', label: 'Postcode', type: 'postal_code', valueKind: 'postal_code', options: { country: 'GB' } },
    { base: 'state', label: 'State', type: 'choice_text', valueKind: 'state', options: { choices: US_STATES, maxDistance: 0 } },
    { base: 'notes', label: rng.pick(['Notes', 'Comments', 'Anything else we should know?']), type: 'text', valueKind: 'notes', entry: 'lines', lines: rng.int(2, 3) },
  ];
}

/** Invented yes/no statements for single checkboxes. */
const CHECK_LABELS = [
  'I agree to the site rules', 'Send reminders by e-mail', 'First visit', 'Returning member', 'Needs accessible parking',
  'Add me to the newsletter', 'Photo consent given', 'I have read the fee schedule', 'Shared plot', 'Overnight stay',
  'Trailer on site', 'Paid in full',
];

const CHOICE_GROUPS: readonly { base: string; label: string; choices: string[]; multiple: boolean }[] = [
  { base: 'contact_by', label: 'Preferred contact:', choices: ['Phone', 'E-mail', 'Mail'], multiple: false },
  { base: 'size', label: 'Size:', choices: ['Small', 'Medium', 'Large'], multiple: false },
  { base: 'payment', label: 'Payment:', choices: ['Cash', 'Check', 'Card'], multiple: false },
  { base: 'days', label: 'Days available:', choices: ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'], multiple: true },
  { base: 'interests', label: 'Interested in:', choices: ['Workshops', 'Volunteering', 'Events', 'Tool library'], multiple: true },
  { base: 'term', label: 'Term:', choices: ['Monthly', 'Seasonal', 'Annual'], multiple: false },
];

/** Hands out field names, numbering repeats so every name is unique on a page. */
export class NameBook {
  private readonly used = new Map<string, number>();

  name(base: string): string {
    const k = (this.used.get(base) ?? 0) + 1;
    this.used.set(base, k);
    return k === 1 ? base : `${base}_${k}`;
  }
}

export function randomItem(rng: Rng, names: NameBook, span: number): ItemSpec {
  const t = rng.pick(templates(rng));
  const { base, ...rest } = t;
  return { ...rest, name: names.name(base), span };
}

export function randomChecks(rng: Rng, names: NameBook): CheckSpec[] {
  return rng
    .shuffle(CHECK_LABELS)
    .slice(0, rng.int(1, 4))
    .map((label) => ({ name: names.name(label.toLowerCase().replace(/[^a-z]+/g, '_').replace(/^_|_$/g, '')), label }));
}

export function randomChoice(rng: Rng, names: NameBook): ChoiceSpec {
  const g = rng.pick(CHOICE_GROUPS);
  return { name: names.name(g.base), label: g.label, choices: g.choices, multiple: g.multiple };
}

export function randomTable(rng: Rng): { columns: TableColumn[]; rows: number } {
  const date = rng.pick(DATE_FORMATS).format;
  const pool: TableColumn[] = [
    { name: 'name', label: 'Name', type: 'text', valueKind: 'other_name', span: 3 },
    { name: 'item', label: 'Crop', type: 'text', valueKind: 'crops', span: 3 },
    { name: 'date', label: 'Date', type: 'date', valueKind: 'past', options: { formats: [date] }, span: 2 },
    { name: 'phone', label: 'Phone', type: 'phone', valueKind: 'phone', options: { defaultRegion: 'US' }, span: 2 },
    { name: 'qty', label: 'Qty', type: 'number', valueKind: 'count', options: { integer: true, decimalSeparator: '.' }, span: 1 },
    { name: 'amount', label: 'Amount', type: 'number', valueKind: 'amount', options: { decimalSeparator: '.' }, span: 1.5 },
  ];
  return { columns: rng.shuffle(pool).slice(0, rng.int(2, 4)), rows: rng.int(2, 5) };
}
