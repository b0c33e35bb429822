import { NameBook, randomChecks, randomChoice, randomItem, randomTable } from './field-catalog.js';
import { LayoutBuilder, type ItemSpec } from './layout-builder.js';
import type { Layout } from './layout-model.js';
import type { Rng } from './prng.js';
import { randomParagraph } from './prose.js';
import type { StyleFamily } from './style-families.js';

const TITLES = [
  'Membership Application', 'Registration Form', 'Intake Form', 'Request for Service', 'Volunteer Sign-up',
  'Equipment Loan Agreement', 'Annual Renewal', 'Visitor Registration', 'Permit Application', 'Enrollment Form',
];
const ORGS = ['Wrenfield Community Trust', 'Port Aldery Harbor Office', 'Cedarmouth Allotment Society', 'Maple Hollow Parish Hall', 'Brindle Bay Co-op'];
const SECTIONS = ['Applicant', 'Contact details', 'Household', 'Vessel', 'Pet information', 'Billing', 'Preferences', 'Office use only', 'Emergency contact', 'Declaration'];

/** Random partition of a row into `k` spans that sum to 1, each at least `min`. */
function spans(rng: Rng, k: number, min = 0.22): number[] {
  const raw = Array.from({ length: k }, () => rng.range(1, 2.5));
  const sum = raw.reduce((s, v) => s + v, 0);
  const out = raw.map((v) => Math.max(min, v / sum));
  const total = out.reduce((s, v) => s + v, 0);
  return out.map((v) => v / total);
}

function fieldRow(rng: Rng, names: NameBook, family: StyleFamily): ItemSpec[] {
  const k = rng.weighted([[1, 3], [2, 5], [3, 4], [4, family.labels === 'cell' ? 2 : 0]] as const);
  const items = spans(rng, k).map((s) => randomItem(rng, names, s));
  // Multi-line areas and signatures want the row to themselves or a wide share of it.
  return items.some((i) => i.entry === 'lines') && k > 2 ? items.filter((i) => i.entry !== 'lines') : items;
}

/** A randomized one-page form in the given style family, for detector training and evaluation. */
export function randomLayout(rng: Rng, family: StyleFamily): Layout {
  const b = new LayoutBuilder(family, rng);
  const names = new NameBook();
  const title = rng.pick(TITLES);
  b.title(title, rng.chance(0.6) ? rng.pick(ORGS) : undefined);
  if (rng.chance(0.6)) b.paragraph(randomParagraph(rng), rng.range(0.7, 0.95));
  const sections = rng.shuffle(SECTIONS);
  let full = false;
  for (let s = 0; s < sections.length && !full && b.remaining > 200; s++) {
    b.section(sections[s]);
    // Small print between fields: negatives for the detector (see prose.ts).
    if (rng.chance(sections[s] === 'Declaration' ? 0.8 : 0.25)) b.paragraph(randomParagraph(rng, 3), rng.range(0.65, 0.9));
    const rows = rng.int(2, 5);
    for (let i = 0; i < rows && !full; i++) {
      // Signatures are one per row at most, so they get a double weight to give the detector enough of them.
      const kind = rng.weighted([['fields', 10], ['checks', 2], ['choice', 2], ['signature', 2], ['table', 1]] as const);
      let ok: boolean;
      if (kind === 'fields') ok = b.row(fieldRow(rng, names, family));
      else if (kind === 'checks') ok = b.checks(randomChecks(rng, names));
      else if (kind === 'choice') ok = b.choice(randomChoice(rng, names));
      else if (kind === 'table') {
        const t = randomTable(rng);
        ok = b.table(names.name('table'), t.columns, t.rows);
      } else {
        ok = b.row([
          { name: names.name('signature'), label: 'Signature', type: 'signature', valueKind: 'signature', span: 0.62 },
          { name: names.name('date_signed'), label: 'Date', type: 'date', valueKind: 'past', options: { formats: ['MM/DD/YYYY'] }, span: 0.38 },
        ]);
      }
      full = !ok;
    }
  }
  b.footer(`Form ${String.fromCharCode(65 + rng.int(0, 25))}${String.fromCharCode(65 + rng.int(0, 25))}-${rng.int(1, 99)} rev. ${rng.int(2019, 2025)}`);
  return b.build('random', title);
}
