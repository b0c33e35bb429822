import type { Layout } from '../layout-model.js';
import { US_STATES } from '../../fields/us-states.js';
import { demoBuilder, must } from './demo-builder.js';

const NAME = 'garden-plot';

/** Invented scenario: a community garden's plot application, on a ruled grid. */
export function gardenPlotLayout(): Layout {
  const b = demoBuilder(NAME, 'ruled-grid');
  const ok = (v: boolean, what: string) => must(v, NAME, what);
  b.title('Plot Application', 'Cedarmouth Community Garden');
  b.section('Applicant');
  ok(b.row([
    { name: 'applicant_name', label: 'Name', type: 'text', valueKind: 'full_name', span: 0.7, required: true },
    { name: 'member_no', label: 'Member no.', type: 'text', valueKind: 'member_id', options: { pattern: '^[0-9]{6}$' }, span: 0.3, entry: 'comb', cells: 6 },
  ]), 'name');
  ok(b.row([
    { name: 'street', label: 'Street address', type: 'text', valueKind: 'street', span: 0.5 },
    { name: 'city', label: 'City', type: 'text', valueKind: 'city', span: 0.25 },
    { name: 'state', label: 'State', type: 'choice_text', valueKind: 'state', options: { choices: US_STATES, maxDistance: 0 }, span: 0.1 },
    { name: 'zip', label: 'ZIP', type: 'postal_code', valueKind: 'postal_code', options: { country: 'US' }, span: 0.15 },
  ]), 'address');
  ok(b.row([
    { name: 'phone', label: 'Phone', type: 'phone', valueKind: 'phone', options: { defaultRegion: 'US' }, span: 0.35, required: true },
    { name: 'email', label: 'E-mail', type: 'email', valueKind: 'email', span: 0.45 },
    { name: 'household', label: 'Household size', type: 'number', valueKind: 'household', options: { integer: true, decimalSeparator: '.', min: 1, max: 20 }, span: 0.2 },
  ]), 'contact');
  ok(b.row([
    { name: 'application_date', label: 'Date of application', type: 'date', valueKind: 'past', options: { formats: ['D MMM YYYY'] }, span: 0.4 },
    { name: 'preferred_plot', label: 'Preferred plot (e.g. B-12)', type: 'text', valueKind: 'plot_id', options: { case: 'upper' }, span: 0.3 },
    { name: 'plot_size_sqft', label: 'Size wanted (sq ft)', type: 'number', valueKind: 'plot_size_sqft', options: { integer: true, decimalSeparator: '.', min: 25, max: 1000 }, span: 0.3 },
  ]), 'plot');
  ok(b.row([{ name: 'crops', label: 'What do you plan to grow?', type: 'text', valueKind: 'crops', span: 1 }]), 'crops');
  b.section('Plot');
  ok(b.choice({ name: 'plot_type', label: 'Plot type:', choices: ['Half plot', 'Full plot', 'Raised bed'], multiple: false, required: true }), 'plot type');
  ok(b.choice({ name: 'help_with', label: 'I can help with:', choices: ['Watering', 'Compost', 'Tool shed', 'Events'], multiple: true }), 'help');
  ok(b.checks([
    { name: 'organic_pledge', label: 'No synthetic pesticides' },
    { name: 'near_water', label: 'Needs a plot near a tap' },
    { name: 'will_share', label: 'Willing to share a plot' },
  ]), 'checks');
  b.section('Other gardeners in the household');
  ok(b.table('gardener', [
    { name: 'name', label: 'Name', type: 'text', valueKind: 'other_name', span: 3 },
    { name: 'phone', label: 'Phone', type: 'phone', valueKind: 'phone', options: { defaultRegion: 'US' }, span: 2 },
  ], 2), 'gardeners');
  ok(b.row([
    { name: 'signature', label: 'Signature', type: 'signature', valueKind: 'signature', span: 0.65, required: true },
    { name: 'date_signed', label: 'Date', type: 'date', valueKind: 'past', options: { formats: ['MM/DD/YYYY'] }, span: 0.35 },
  ]), 'signature');
  b.footer('Invented demo form (formglean samples). CCG-2');
  return b.build(NAME, 'Plot Application');
}
