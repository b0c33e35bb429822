import type { Layout } from '../layout-model.js';
import { demoBuilder, must } from './demo-builder.js';

const NAME = 'marina-slip';

/** Invented scenario: a marina's seasonal slip-rental application. */
export function marinaSlipLayout(): Layout {
  const b = demoBuilder(NAME, 'ledger');
  const ok = (v: boolean, what: string) => must(v, NAME, what);
  b.title('Seasonal Slip Rental Application', 'Port Aldery Marina');
  b.paragraph('Print clearly. One application per vessel. Write the registration number one character per box.');
  b.section('Applicant');
  ok(b.row([{ name: 'applicant_name', label: 'Full name *', type: 'text', valueKind: 'full_name', span: 1, required: true }]), 'name');
  ok(b.row([
    { name: 'street', label: 'Address', type: 'text', valueKind: 'street', span: 0.6 },
    { name: 'city', label: 'City', type: 'text', valueKind: 'city', span: 0.4 },
  ]), 'address');
  ok(b.row([
    { name: 'postal_code', label: 'Postal code (Canada)', type: 'postal_code', valueKind: 'postal_code', options: { country: 'CA' }, span: 0.5 },
    { name: 'phone', label: 'Phone *', type: 'phone', valueKind: 'phone', options: { defaultRegion: 'US' }, span: 0.5, required: true },
  ]), 'postal/phone');
  ok(b.row([{ name: 'email', label: 'E-mail', type: 'email', valueKind: 'email', span: 1 }]), 'email');
  b.section('Vessel');
  ok(b.row([
    { name: 'vessel_name', label: 'Vessel name', type: 'text', valueKind: 'boat_name', span: 0.55 },
    { name: 'vessel_type', label: 'Type', type: 'text', valueKind: 'boat_make', span: 0.45 },
  ]), 'vessel');
  ok(b.row([
    { name: 'registration', label: 'Registration no. *', type: 'text', valueKind: 'registration', options: { case: 'upper', pattern: '^[A-Z]{2}[0-9]{4}[A-Z]{2}$' }, span: 1, entry: 'comb', cells: 10, required: true },
  ]), 'registration');
  ok(b.row([
    { name: 'length_ft', label: 'Length (ft)', type: 'number', valueKind: 'boat_length_ft', options: { integer: true, decimalSeparator: '.', min: 8, max: 120, unit: 'ft' }, span: 0.34 },
    { name: 'beam_ft', label: 'Beam (ft)', type: 'number', valueKind: 'beam_ft', options: { decimalSeparator: '.', min: 2, max: 40, unit: 'ft' }, span: 0.33 },
    { name: 'draft_ft', label: 'Draft (ft)', type: 'number', valueKind: 'draft_ft', options: { decimalSeparator: '.', min: 0.5, max: 20, unit: 'ft' }, span: 0.33 },
  ]), 'dimensions');
  ok(b.choice({ name: 'propulsion', label: 'Propulsion:', choices: ['Sail', 'Power', 'Paddle'], multiple: false, required: true }), 'propulsion');
  ok(b.choice({ name: 'hookups', label: 'Hook-ups needed:', choices: ['30 A', '50 A', 'Water', 'Pump-out'], multiple: true }), 'hookups');
  b.section('Stay and insurance');
  ok(b.row([
    { name: 'arrival_date', label: 'Arrival', type: 'date', valueKind: 'upcoming', options: { formats: ['YYYY-MM-DD'] }, span: 0.5, entry: 'parts', parts: [4, 2, 2], separator: '-' },
    { name: 'departure_date', label: 'Departure', type: 'date', valueKind: 'upcoming', options: { formats: ['YYYY-MM-DD'] }, span: 0.5, entry: 'parts', parts: [4, 2, 2], separator: '-' },
  ]), 'dates');
  ok(b.row([
    { name: 'insurer_postcode', label: 'Insurer postcode (UK)', type: 'postal_code', valueKind: 'postal_code', options: { country: 'GB' }, span: 0.5 },
    { name: 'storage_zip', label: 'Winter storage ZIP', type: 'postal_code', valueKind: 'postal_code', options: { country: 'US' }, span: 0.5 },
  ]), 'insurer');
  ok(b.checks([
    { name: 'liveaboard', label: 'Will live aboard' },
    { name: 'insurance_attached', label: 'Proof of insurance attached' },
  ]), 'checks');
  b.section('Declaration');
  ok(b.row([
    { name: 'signature', label: 'Signature *', type: 'signature', valueKind: 'signature', span: 0.62, required: true },
    { name: 'date_signed', label: 'Date', type: 'date', valueKind: 'past', options: { formats: ['DD.MM.YYYY'] }, span: 0.38 },
  ]), 'signature');
  b.footer('Invented demo form (formglean samples). PAM-7');
  return b.build(NAME, 'Seasonal Slip Rental Application');
}
