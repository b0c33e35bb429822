import { readFile } from 'node:fs/promises';
import { CsvError, parse } from 'csv-parse/sync';
import { configError } from '../errors.js';
import type { QueueColumn } from './queue-columns.js';
import { QUEUE_COLUMNS, REQUIRED_COLUMNS } from './queue-columns.js';
import { unguardCell } from './formula-guard.js';

/** One data row of a review queue as a person left it, with formula guards removed. */
export interface QueueEntry {
  /** 1-based line of the file where the row starts (the header is line 1). */
  line: number;
  cells: Partial<Record<QueueColumn, string>>;
}

export interface ReviewQueueFile {
  entries: QueueEntry[];
  /** Header names found that the queue does not define (kept by spreadsheets, ignored here). */
  extraColumns: string[];
  delimiter: string;
}

/**
 * Field delimiters spreadsheets write when saving CSV: comma, semicolon (locales with a decimal comma) and tab
 * ("Unicode text" exports). Common practice.
 */
const DELIMITERS = [',', ';', '\t'] as const;

/** Header cell as a column key: case, surrounding blanks and inner spaces do not matter. */
function headerKey(h: string): string {
  return unguardCell(h).trim().toLowerCase().replace(/\s+/g, '_');
}

/** Decode the file: UTF-8 with or without BOM, or UTF-16 with BOM; anything else is refused. */
function decode(file: string, bytes: Buffer): string {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return new TextDecoder('utf-16le').decode(bytes.subarray(2));
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return new TextDecoder('utf-16be').decode(bytes.subarray(2));
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
  } catch {
    throw configError(file, 'not UTF-8 text; save the queue as "CSV UTF-8"');
  }
}

/** The delimiter under which the first line names the most queue columns. */
function detectDelimiter(file: string, text: string): string {
  let best: { d: string; hits: number } = { d: ',', hits: -1 };
  for (const d of DELIMITERS) {
    let header: string[] = [];
    try {
      header = (parse(text, { delimiter: d, to_line: 1, relax_quotes: true, relax_column_count: true }) as string[][])[0] ?? [];
    } catch {
      continue;
    }
    const hits = header.map(headerKey).filter((h) => (QUEUE_COLUMNS as readonly string[]).includes(h)).length;
    if (hits > best.hits) best = { d, hits };
  }
  if (best.hits <= 0) throw configError(file, `line 1: no review-queue header (expected columns such as ${REQUIRED_COLUMNS.join(', ')})`);
  return best.d;
}

function csvProblem(err: CsvError, lastGoodLine: number): string {
  switch (err.code) {
    case 'CSV_QUOTE_NOT_CLOSED':
      return `line ${lastGoodLine + 1}: a quoted cell is never closed; the file looks cut short`;
    case 'CSV_RECORD_INCONSISTENT_COLUMNS':
    case 'CSV_RECORD_INCONSISTENT_FIELDS_LENGTH':
      return `line ${(err as CsvError & { lines?: number }).lines ?? lastGoodLine + 1}: row has a different number of cells than the header; the file looks cut short or damaged`;
    default:
      return `line ${lastGoodLine + 1}: ${err.message.split('\n')[0]}`;
  }
}

/** Newlines inside a record's raw text, not counting the record delimiter that ends it. */
function innerLineBreaks(raw: string): number {
  const body = raw.replace(/\r\n$|\n$|\r$/, '');
  return (body.match(/\r\n|\n|\r/g) ?? []).length;
}

/**
 * Parse a queue file as people leave it after a spreadsheet: columns found by header name in any order, extra
 * columns ignored, CRLF or LF, with or without BOM, comma/semicolon/tab delimited. A damaged file (a quote left
 * open, a row with missing cells) is refused whole with one line naming the file and line, so that nothing from
 * a half-saved queue is applied.
 */
export function parseReviewQueue(file: string, bytes: Buffer): ReviewQueueFile {
  const text = decode(file, bytes).replace(/^\uFEFF/, '');
  const delimiter = detectDelimiter(file, text);
  let lastGoodLine = 1;
  let records: { record: Record<string, string>; raw: string; info: { lines: number } }[];
  let header: string[] = [];
  try {
    records = parse(text, {
      delimiter,
      bom: true,
      columns: (names: string[]) => {
        header = names.map((h, i) => headerKey(h) || `(unnamed column ${i + 1})`);
        return header;
      },
      group_columns_by_name: false,
      skip_empty_lines: true,
      // Rows a spreadsheet writes as bare delimiters (cleared, not deleted) carry nothing.
      skip_records_with_empty_values: true,
      info: true,
      raw: true,
      on_record: (rec: unknown, ctx: { lines: number }) => {
        lastGoodLine = ctx.lines;
        return rec;
      },
    }) as unknown as typeof records;
  } catch (err) {
    if (err instanceof CsvError) throw configError(file, csvProblem(err, lastGoodLine));
    throw err;
  }
  const seen = new Set<string>();
  for (const h of header) {
    if (seen.has(h)) throw configError(file, `line 1: column "${h}" appears twice`);
    seen.add(h);
  }
  const missing = REQUIRED_COLUMNS.filter((c) => !seen.has(c));
  if (missing.length > 0) throw configError(file, `line 1: missing column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}`);
  const known = new Set<string>(QUEUE_COLUMNS);
  const entries: QueueEntry[] = records.map(({ record, raw, info }) => {
    const cells: Partial<Record<QueueColumn, string>> = {};
    for (const c of QUEUE_COLUMNS) if (c in record) cells[c] = unguardCell(record[c] ?? '');
    return { line: info.lines - innerLineBreaks(raw), cells };
  });
  return { entries, extraColumns: header.filter((h) => !known.has(h)), delimiter };
}

export async function readReviewQueue(file: string): Promise<ReviewQueueFile> {
  let bytes: Buffer;
  try {
    bytes = await readFile(file);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw configError(file, code === 'ENOENT' ? 'queue file not found' : `cannot read queue file (${code ?? 'error'})`);
  }
  return parseReviewQueue(file, bytes);
}
