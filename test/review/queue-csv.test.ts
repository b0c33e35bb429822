import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { buildQueueRows, queueCsv } from '../../src/review/queue-write.js';
import { parseReviewQueue } from '../../src/review/queue-read.js';
import { guardCell, unguardCell } from '../../src/review/formula-guard.js';
import { QUEUE_COLUMNS } from '../../src/review/queue-columns.js';
import { documentResult, field } from './fixture.js';

const noCrops = () => ({ crop: '', context: '' });

describe('formula guard', () => {
  // OWASP "CSV Injection" community page: cells starting with = + - @ tab (0x09) or carriage return (0x0D)
  // must be prefixed with a single quote. OWASP ASVS 5.0 req. 1.2.10 adds NUL.
  const owaspPrefixes = ['=', '+', '-', '@', '\t', '\r', '\0'];
  it.each(owaspPrefixes.map((p) => [JSON.stringify(p)]))('guards a cell starting with %s', (json) => {
    const p = JSON.parse(json) as string;
    const cell = `${p}HYPERLINK("http://example.org","x")`;
    expect(guardCell(cell)).toBe(`'${cell}`);
    expect(unguardCell(guardCell(cell))).toBe(cell);
  });

  it('leaves harmless cells alone and reverses exactly, apostrophes included', () => {
    // Round-trip property: what goes out guarded comes back unchanged (common practice for reversible escaping).
    for (const s of ['', 'Robin Quill', "O'Hara", "'", "''", "'=1", "''=1", "'+", 'a=b', ' =1', '555-0142', '2026-03-02']) {
      expect(unguardCell(guardCell(s))).toBe(s);
    }
    expect(guardCell('Robin Quill')).toBe('Robin Quill');
    expect(guardCell("O'Hara")).toBe("O'Hara");
  });
});

describe('queue CSV', () => {
  const doc = documentResult('intake-0001', [
    field('owner_name', 'text', 'Quill, "Robin"', 'review', { raw: 'Quill, "Robin"\nline two' }),
    field('pet_name', 'text', 'Biscuit', 'accepted'),
    field('balance', 'text', '-12.50', 'invalid', { raw: '=SUM(A1:A9)' }),
    field('email', 'text', null, 'missing', { raw: null, box: null }),
  ]);
  const rows = buildQueueRows([doc], noCrops);
  const text = queueCsv(rows);

  it('has one row per field that waits for review, none for accepted fields', () => {
    expect(rows.map((r) => r.field)).toEqual(['owner_name', 'balance', 'email']);
    expect(rows.every((r) => /^r[0-9a-f]{16}$/.test(r.row_id))).toBe(true);
  });

  it('is RFC 4180: CRLF records, header first, quotes doubled, commas and newlines inside quoted cells', () => {
    expect(text.charCodeAt(0)).toBe(0xfeff); // UTF-8 BOM (common practice for spreadsheets)
    const body = text.slice(1);
    // RFC 4180 §2.1: each record ends with CRLF; §2.3: first line is the header.
    expect(body.startsWith(`"${QUEUE_COLUMNS[0]}","${QUEUE_COLUMNS[1]}"`)).toBe(true);
    expect(body.endsWith('\r\n')).toBe(true);
    // RFC 4180 §2.7: a double quote inside a quoted field is escaped by another double quote.
    expect(body).toContain('"Quill, ""Robin"""');
    // RFC 4180 §2.6: fields with line breaks, double quotes or commas are enclosed in double quotes.
    expect(body).toContain('"Quill, ""Robin""\nline two"');
    // An independent RFC 4180 reader (csv-parse, strict column count) gets the exact cells back.
    const parsed = parse(body, { columns: true }) as Record<string, string>[];
    expect(parsed).toHaveLength(3);
    expect(parsed[0].value).toBe('Quill, "Robin"');
    expect(parsed[0].raw).toBe('Quill, "Robin"\nline two');
  });

  it('guards formula-like cells in the file (OWASP CSV injection) and reverses them on reading', () => {
    const parsed = parse(text.slice(1), { columns: true }) as Record<string, string>[];
    // OWASP CSV Injection: a leading apostrophe keeps =SUM(...) and -12.50 from being evaluated.
    expect(parsed[1].raw).toBe("'=SUM(A1:A9)");
    expect(parsed[1].value).toBe("'-12.50");
    const back = parseReviewQueue('queue.csv', Buffer.from(text, 'utf8'));
    expect(back.entries[1].cells.raw).toBe('=SUM(A1:A9)');
    expect(back.entries[1].cells.value).toBe('-12.50');
    expect(back.entries.map((e) => e.line)).toEqual([2, 4, 5]); // the first row spans lines 2-3
  });

  it('gives the same row ids for the same scan and field on every export', () => {
    expect(buildQueueRows([doc], noCrops).map((r) => r.row_id)).toEqual(rows.map((r) => r.row_id));
  });
});
