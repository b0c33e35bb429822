import type { Layout } from '../layout-model.js';
import { US_STATES } from '../../fields/us-states.js';
import { demoBuilder, must } from './demo-builder.js';

const NAME = 'clinic-intake';

/** Invented scenario: a small animal clinic's new-client form. Uses every field type. */
export function clinicIntakeLayout(): Layout {
  const b = demoBuilder(NAME, 'boxed-above');
  const ok = (v: boolean, what: string) => must(v, NAME, what);
  b.title('New Client & Patient Registration', 'Fernmoor Small Animal Clinic');
  b.section('Owner');
  ok(b.row([
    { name: 'owner_last_name', label: 'Last name *', type: 'text', valueKind: 'last_name', span: 0.5, required: true },
    { name: 'owner_first_name', label: 'First name *', type: 'text', valueKind: 'first_name', span: 0.5, required: true },
  ]), 'names');
  ok(b.row([
    { name: 'street', label: 'Street address', type: 'text', valueKind: 'street', span: 0.62 },
    { name: 'city', label: 'City', type: 'text', valueKind: 'city', span: 0.38 },
  ]), 'address');
  ok(b.row([
    { name: 'state', label: 'State', type: 'choice_text', valueKind: 'state', options: { choices: US_STATES, maxDistance: 0 }, span: 0.16 },
    { name: 'zip', label: 'ZIP code', type: 'postal_code', valueKind: 'postal_code', options: { country: 'US' }, span: 0.3 },
    { name: 'phone', label: 'Phone *', type: 'phone', valueKind: 'phone', options: { defaultRegion: 'US' }, span: 0.54, required: true },
  ]), 'state/zip/phone');
  ok(b.row([
    { name: 'email', label: 'E-mail', type: 'email', valueKind: 'email', span: 0.6 },
    { name: 'visit_date', label: "Today's date", type: 'date', valueKind: 'past', options: { formats: ['MM/DD/YYYY'] }, span: 0.4, entry: 'parts', parts: [2, 2, 4], separator: '/' },
  ]), 'email/date');
  b.section('Patient');
  ok(b.row([
    { name: 'pet_name', label: "Pet's name *", type: 'text', valueKind: 'pet_name', span: 0.38, required: true },
    { name: 'breed', label: 'Breed / colour', type: 'text', valueKind: 'breed', span: 0.37 },
    { name: 'weight_kg', label: 'Weight (kg)', type: 'number', valueKind: 'weight_kg', options: { decimalSeparator: '.', min: 0, max: 120, unit: 'kg' }, span: 0.25 },
  ]), 'pet');
  ok(b.choice({ name: 'species', label: 'Species:', choices: ['Dog', 'Cat', 'Rabbit', 'Bird', 'Other'], multiple: false, required: true }), 'species');
  ok(b.choice({ name: 'sex', label: 'Sex:', choices: ['Male', 'Female'], multiple: false }), 'sex');
  ok(b.row([
    { name: 'pet_birth_date', label: 'Date of birth (approx.)', type: 'date', valueKind: 'pet_birth', options: { formats: ['MM/DD/YYYY'], notFuture: true }, span: 0.45 },
    { name: 'tag_number', label: 'Licence tag no.', type: 'text', valueKind: 'member_id', options: { pattern: '^[0-9]{6}$' }, span: 0.55, entry: 'comb', cells: 6 },
  ]), 'birth/tag');
  ok(b.checks([
    { name: 'spayed_neutered', label: 'Spayed / neutered' },
    { name: 'microchipped', label: 'Microchipped' },
    { name: 'vacc_rabies', label: 'Rabies vaccine current' },
    { name: 'vacc_distemper', label: 'Distemper vaccine current' },
  ]), 'checks');
  ok(b.row([
    { name: 'last_vaccination', label: 'Last vaccination', type: 'date', valueKind: 'past', options: { formats: ['D MMM YYYY'] }, span: 0.4 },
    { name: 'previous_clinic', label: 'Previous clinic (city)', type: 'text', valueKind: 'city', span: 0.6 },
  ]), 'vaccination');
  ok(b.row([{ name: 'notes', label: 'Allergies, medication, behaviour notes', type: 'text', valueKind: 'notes', span: 1, entry: 'lines', lines: 2 }]), 'notes');
  b.section('Consent');
  ok(b.checks([{ name: 'reminders_by_email', label: 'Send vaccination reminders by e-mail' }]), 'reminders');
  ok(b.row([
    { name: 'signature', label: 'Owner signature *', type: 'signature', valueKind: 'signature', span: 0.62, required: true },
    { name: 'date_signed', label: 'Date', type: 'date', valueKind: 'past', options: { formats: ['MM/DD/YYYY'] }, span: 0.38 },
  ]), 'signature');
  b.footer('Invented demo form (formglean samples). FSAC-1');
  return b.build(NAME, 'New Client & Patient Registration');
}
