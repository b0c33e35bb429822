import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { recordsCsv, recordsJsonl, recordTable, recordTablesByLayout } from '../../src/review/export-table.js';
import { reviewStatus } from '../../src/review/status.js';
import { documentResult, field } from './fixture.js';

const clinic = documentResult('intake-0002', [
  field('owner_name', 'text', 'Quill, Robin', 'corrected'),
  field('phone', 'phone', '+12075550142', 'confirmed'),
  field('weight_kg', 'number', -1.5, 'review'),
  field('vaccinated', 'checkbox', true, 'accepted'),
]);
const marinaFields = [
  field('owner_name', 'text', 'Sam Harbor', 'accepted'),
  field('services', 'choice', ['water', 'power'], 'accepted'),
  field('boat_length_ft', 'number', null, 'missing'),
];
const marina = { ...documentResult('slip-0001', marinaFields), schema: { name: 'marina-slip', version: '3', path: '/nonexistent/marina-slip.yaml', sha256: 'c'.repeat(64) } };

describe('export', () => {
  const table = recordTable([marina, clinic], { withStatus: true });
  const tables = recordTablesByLayout([marina, clinic], { withStatus: true });

  it('makes one table per layout: a row per document, a column per field of that layout only', () => {
    expect([...tables.keys()]).toEqual(['clinic-intake', 'marina-slip']);
    const c = tables.get('clinic-intake')!;
    const m = tables.get('marina-slip')!;
    expect(c.rows.map((r) => r['document.id'])).toEqual(['intake-0002']);
    expect(c.columns.slice(6)).toEqual(['owner_name', 'owner_name.status', 'phone', 'phone.status', 'weight_kg', 'weight_kg.status', 'vaccinated', 'vaccinated.status']);
    expect(m.columns.slice(6)).toEqual(['owner_name', 'owner_name.status', 'services', 'services.status', 'boat_length_ft', 'boat_length_ft.status']);
    expect(c.rows[0]['review.pending']).toBe(1);
    // Same-named fields of different forms no longer share a column: each table has its own owner_name.
    expect(m.rows[0].owner_name).toBe('Sam Harbor');
  });

  it('writes JSON Lines with values in their JSON types', () => {
    // JSON Lines: one valid JSON value per line, separated by \n (jsonlines.org).
    const lines = recordsJsonl(table).trimEnd().split('\n').map((l) => JSON.parse(l));
    expect(lines[0]).toMatchObject({ owner_name: 'Quill, Robin', weight_kg: -1.5, vaccinated: true, services: null });
    expect(lines[1]).toMatchObject({ services: ['water', 'power'], boat_length_ft: null, 'boat_length_ft.status': 'missing' });
  });

  it('writes RFC 4180 CSV, formula-guarded unless asked not to', () => {
    const text = recordsCsv(table, { formulaGuard: true, bom: false });
    expect(text.endsWith('\r\n')).toBe(true); // RFC 4180 §2.1 CRLF
    expect(text).toContain('"Quill, Robin"'); // RFC 4180 §2.6: a comma inside a field needs quotes
    const rows = parse(text, { columns: true }) as Record<string, string>[];
    // OWASP CSV injection: leading + and - get an apostrophe.
    expect(rows[0].phone).toBe("'+12075550142");
    expect(rows[0].weight_kg).toBe("'-1.5");
    expect(rows[1].services).toBe('water; power');
    const bare = parse(recordsCsv(table, { formulaGuard: false, bom: true }), { columns: true, bom: true }) as Record<string, string>[];
    expect(bare[0].phone).toBe('+12075550142');
  });
});

describe('review status', () => {
  it('groups by layout and lists only the fields and documents that went to review', () => {
    const s = reviewStatus([marina, clinic]);
    expect(s.total).toEqual({ pending: 2, corrected: 1, confirmed: 1 });
    expect(s.byDocument).toEqual([
      { document: 'intake-0002', layout: 'clinic-intake', pending: 1, corrected: 1, confirmed: 1 },
      { document: 'slip-0001', layout: 'marina-slip', pending: 1, corrected: 0, confirmed: 0 },
    ]);
    expect(s.byLayout.map((l) => [l.layout, l.documents, l.documentsDone])).toEqual([['clinic-intake', 1, 0], ['marina-slip', 1, 0]]);
    // Accepted-only fields (vaccinated, services, the marina's owner_name) are not listed.
    expect(s.byLayout[0].fields).toEqual([
      { field: 'owner_name', pending: 0, corrected: 1, confirmed: 0 },
      { field: 'phone', pending: 0, corrected: 0, confirmed: 1 },
      { field: 'weight_kg', pending: 1, corrected: 0, confirmed: 0 },
    ]);
    expect(s.byLayout[1].fields).toEqual([{ field: 'boat_length_ft', pending: 1, corrected: 0, confirmed: 0 }]);
  });
});
