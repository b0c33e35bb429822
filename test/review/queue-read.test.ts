import { describe, expect, it } from 'vitest';
import { stringify } from 'csv-stringify/sync';
import { parseReviewQueue } from '../../src/review/queue-read.js';

const header = ['row_id', 'document', 'result_hash', 'field', 'value', 'correction', 'confirm', 'note'];
const rows = [
  ['r0123456789abcdef', 'intake-0001', 'f'.repeat(64), 'visit_date', '', '03/14/2026', '', 'from the card'],
  ['r1123456789abcdef', 'intake-0001', 'f'.repeat(64), 'phone', "'+12075550142", '', 'yes', ''],
];

describe('reading a queue a spreadsheet saved', () => {
  it('reads semicolon-separated files (spreadsheets in decimal-comma locales) by header name', () => {
    const text = stringify([header, ...rows], { delimiter: ';', record_delimiter: '\r\n' });
    const q = parseReviewQueue('q.csv', Buffer.from(text));
    expect(q.delimiter).toBe(';');
    expect(q.entries.map((e) => [e.line, e.cells.field, e.cells.correction, e.cells.confirm])).toEqual([
      [2, 'visit_date', '03/14/2026', ''],
      [3, 'phone', '', 'yes'],
    ]);
    expect(q.entries[1].cells.value).toBe('+12075550142'); // formula guard removed
  });

  it('reads UTF-16 tab-separated text with a BOM ("Unicode text" exports)', () => {
    const text = stringify([header, ...rows], { delimiter: '\t' });
    const bytes = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    const q = parseReviewQueue('q.txt', bytes);
    expect(q.entries.map((e) => e.cells.note)).toEqual(['from the card', '']);
  });

  it('accepts headers in other case and spacing, extra columns, and rows cleared to bare delimiters', () => {
    const h = ['Note', ' CORRECTION ', 'Confirm', 'Row ID', 'result_hash', 'checked by'];
    const text = stringify([h, ['', 'Robin Quill', '', 'r0123456789abcdef', 'f'.repeat(64), 'RQ'], ['', '', '', '', '', ''], ['a', '', 'x', 'r1', 'h', '']]);
    const q = parseReviewQueue('q.csv', Buffer.from(text));
    expect(q.extraColumns).toEqual(['checked_by']);
    expect(q.entries.map((e) => [e.line, e.cells.row_id, e.cells.correction])).toEqual([
      [2, 'r0123456789abcdef', 'Robin Quill'],
      [4, 'r1', ''],
    ]);
  });

  it('refuses with one line naming file and line: missing columns, repeated columns, not UTF-8, no header', () => {
    const noConfirm = stringify([header.filter((c) => c !== 'confirm'), ...rows.map((r) => r.slice(0, 7))]);
    expect(() => parseReviewQueue('q.csv', Buffer.from(noConfirm))).toThrow(/^q\.csv: line 1: missing column confirm$/);
    const twice = stringify([[...header, 'note'], ...rows.map((r) => [...r, ''])]);
    expect(() => parseReviewQueue('q.csv', Buffer.from(twice))).toThrow(/^q\.csv: line 1: column "note" appears twice$/);
    // "é" in Windows-1252 is the single byte 0xE9, which is not valid UTF-8 on its own (RFC 3629 §3).
    const latin1 = Buffer.concat([Buffer.from(stringify([header]) + 'r0,intake-0001,h,owner_name,'), Buffer.from([0xe9]), Buffer.from(',,,\n')]);
    expect(() => parseReviewQueue('q.csv', latin1)).toThrow(/^q\.csv: not UTF-8 text/);
    expect(() => parseReviewQueue('q.csv', Buffer.from('hello,world\n1,2\n'))).toThrow(/^q\.csv: line 1: no review-queue header/);
  });
});
