import { stringify } from 'csv-stringify/sync';
import type { FieldValue } from '../fields/types.js';
import type { DocumentResult } from '../result/document.js';
import { valueToCell } from './cell-value.js';
import { guardCell } from './formula-guard.js';
import { isPending } from './pending.js';
import { queueMode } from './layout-question.js';

/**
 * Columns about the record itself. Dotted names cannot clash with field names (schema field names are
 * lower-case letters, digits and underscores).
 */
export const RECORD_COLUMNS = ['document.id', 'document.path', 'document.sha256', 'schema.name', 'schema.version', 'review.pending'] as const;

export interface RecordTable {
  columns: string[];
  /** One record per document, in document id order; a field the document's schema lacks is null. */
  rows: Record<string, FieldValue>[];
}

/** Suffix of the optional per-field status column. */
export const STATUS_SUFFIX = '.status';

/** One flat table of records: a row per document, a column per field (first-seen order across schemas); export uses it per layout. Pure. */
export function recordTable(results: readonly DocumentResult[], options: { withStatus?: boolean } = {}): RecordTable {
  const sorted = [...results].sort((a, b) => (a.document.id < b.document.id ? -1 : a.document.id > b.document.id ? 1 : 0));
  const fieldNames: string[] = [];
  for (const r of sorted) for (const f of r.fields) if (!fieldNames.includes(f.name)) fieldNames.push(f.name);
  const fieldColumns = fieldNames.flatMap((n) => (options.withStatus ? [n, `${n}${STATUS_SUFFIX}`] : [n]));
  const rows = sorted.map((r) => {
    const row: Record<string, FieldValue> = {
      'document.id': r.document.id,
      'document.path': r.document.path,
      'document.sha256': r.document.sha256,
      'schema.name': r.schema.name,
      'schema.version': r.schema.version,
      'review.pending': r.fields.filter((f) => isPending(f.status)).length,
    };
    for (const c of fieldColumns) row[c] = null;
    for (const f of r.fields) {
      row[f.name] = f.value;
      if (options.withStatus) row[`${f.name}${STATUS_SUFFIX}`] = f.status;
    }
    return row;
  });
  return { columns: [...RECORD_COLUMNS, ...fieldColumns], rows };
}

/**
 * One table per layout (schema name), layouts in name order: forms of different layouts have different fields, and
 * a same-named field of two forms may mean different things, so they never share a column. A document a person set
 * aside as another form or as none of the forms is no record of the layout it was read as, and is left out. Pure.
 */
export function recordTablesByLayout(results: readonly DocumentResult[], options: { withStatus?: boolean } = {}): Map<string, RecordTable> {
  const groups = new Map<string, DocumentResult[]>();
  for (const r of results.filter((x) => queueMode(x) !== 'none')) groups.set(r.schema.name, [...(groups.get(r.schema.name) ?? []), r]);
  const names = [...groups.keys()].sort();
  return new Map(names.map((n) => [n, recordTable(groups.get(n)!, options)]));
}

/** JSON Lines (one JSON object per line, values in their JSON types). */
export function recordsJsonl(table: RecordTable): string {
  return table.rows.map((r) => JSON.stringify(Object.fromEntries(table.columns.map((c) => [c, r[c] ?? null])))).join('\n') + (table.rows.length ? '\n' : '');
}

/**
 * RFC 4180 CSV (CRLF, header line, quotes where needed). Cells are guarded against formula injection (OWASP CSV
 * injection guidance) unless a machine consumer asks for them bare.
 */
export function recordsCsv(table: RecordTable, options: { formulaGuard: boolean; bom: boolean }): string {
  const cell = (v: FieldValue | undefined) => {
    const s = valueToCell(v ?? null);
    return options.formulaGuard ? guardCell(s) : s;
  };
  return stringify(
    table.rows.map((r) => table.columns.map((c) => cell(r[c]))),
    // A lone LF or CR inside a cell ends the row for most readers unless the cell is quoted (RFC 4180 §2.6); by
    // itself csv-stringify quotes only cells holding the whole record delimiter (CRLF here), so ask for the rest.
    { header: true, columns: table.columns, bom: options.bom, record_delimiter: 'windows', quoted_match: /[\r\n]/ },
  );
}
