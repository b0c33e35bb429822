import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { recordsCsv, recordsJsonl, recordTable } from '../../src/review/export-table.js';
import { reviewStatus } from '../../src/review/status.js';
import { documentResult, field } from './fixture.js';

const clinic = documentResult('intake-0002', [
  field('owner_name', 'text', 'Quill, Robin', 'corrected'),
  field('phone', 'phone', '+12075550142', 'confirmed'),
  field('weight_kg', 'number', -1.5, 'review'),
  field('vaccinated', 'checkbox', true, 'accepted'),
]);
const marina = documentResult('slip-0001', [
  field('owner_name', 'text', 'Sam Harbor', 'accepted'),
  field('services', 'choice', ['water', 'power'], 'accepted'),
  field('boat_length_ft', 'number', null, 'missing'),
]);

describe('export', () => {
  const table = recordTable([marina, clinic], { withStatus: true });

  it('makes one row per document and one column per field across schemas', () => {
    expect(table.rows.map((r) => r['document.id'])).toEqual(['intake-0002', 'slip-0001']);
    expect(table.columns.slice(6)).toEqual([
      'owner_name', 'owner_name.status', 'phone', 'phone.status', 'weight_kg', 'weight_kg.status',
      'vaccinated', 'vaccinated.status', 'services', 'services.status', 'boat_length_ft', 'boat_length_ft.status',
    ]);
    expect(table.rows[0]['review.pending']).toBe(1);
    expect(table.rows[1].phone).toBeNull();
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
  it('counts pending, corrected and confirmed per field and per document', () => {
    const s = reviewStatus([marina, clinic]);
    expect(s.total).toEqual({ pending: 2, corrected: 1, confirmed: 1 });
    expect(s.byDocument).toEqual([
      { document: 'intake-0002', pending: 1, corrected: 1, confirmed: 1 },
      { document: 'slip-0001', pending: 1, corrected: 0, confirmed: 0 },
    ]);
    expect(s.byField.find((f) => f.field === 'owner_name')).toEqual({ field: 'owner_name', pending: 0, corrected: 1, confirmed: 0 });
  });
});
