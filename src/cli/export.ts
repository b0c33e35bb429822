import path from 'node:path';
import type { Command } from 'commander';
import { Option } from 'commander';
import { configError, printable } from '../errors.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import type { RecordTable } from '../review/export-table.js';
import { recordsCsv, recordsJsonl, recordTable, recordTablesByLayout } from '../review/export-table.js';
import { readResultsFolder } from '../review/result-store.js';
import { isFailed } from '../results/results-line.js';

interface ExportOptions {
  results: string;
  format: 'csv' | 'jsonl';
  out?: string;
  schema?: string;
  withStatus?: boolean;
  bom?: boolean;
  formulaGuard: boolean;
}

/** records.csv with layout marina-slip -> records.marina-slip.csv (beside it, same extension). */
export function layoutFile(out: string, layout: string): string {
  const ext = path.extname(out);
  return path.join(path.dirname(out), `${path.basename(out, ext)}.${layout}${ext}`);
}

/** `formglean export`: the checked records as tables for downstream systems, one per form layout. */
export function registerExportCommand(program: Command): void {
  program
    .command('export')
    .description('Write the records as tables, one per form layout: a row per document, a column per field of that layout')
    .requiredOption('--results <dir>', 'the extract output folder')
    .addOption(new Option('--format <format>', 'table format').choices(['csv', 'jsonl']).default('csv'))
    .option('--out <file>', 'write here (atomically) instead of to standard output; with several layouts, one file per layout named <file>.<layout>.<ext>')
    .option('--schema <name>', 'export only the documents of this layout (schema name)')
    .option('--with-status', 'add a <field>.status column after each field')
    .option('--bom', 'start the CSV with a UTF-8 byte order mark (for spreadsheets)')
    .option('--no-formula-guard', 'do not prefix formula-like CSV cells with an apostrophe (for machine consumers)')
    .action(async (opts: ExportOptions) => {
      const folder = await readResultsFolder(opts.results);
      const tables = recordTablesByLayout(folder.documents.map((d) => d.result), { withStatus: opts.withStatus });
      const layouts = [...tables.keys()];
      if (opts.schema !== undefined && !tables.has(opts.schema))
        throw configError(opts.results, `no document of layout "${opts.schema}"; layouts here: ${layouts.join(', ') || 'none'}`);
      const chosen = opts.schema !== undefined ? [opts.schema] : layouts;
      if (chosen.length > 1 && !opts.out)
        throw configError(opts.results, `documents of ${chosen.length} layouts (${chosen.join(', ')}): give --schema NAME, or --out FILE for one file per layout`);
      const text = (t: RecordTable) => (opts.format === 'jsonl' ? recordsJsonl(t) : recordsCsv(t, { formulaGuard: opts.formulaGuard, bom: opts.bom ?? false }));
      const failed = folder.lines.filter(isFailed).length;
      if (failed > 0) process.stderr.write(`${failed} failed document(s) have no record and are not exported\n`);
      if (!opts.out) {
        // One layout (or none): the table to standard output; with no documents, an empty table.
        const t = chosen.length === 1 ? tables.get(chosen[0])! : recordTable([]);
        process.stdout.write(text(t));
        return;
      }
      for (const layout of chosen) {
        const t = tables.get(layout)!;
        const file = chosen.length > 1 ? layoutFile(opts.out, layout) : opts.out;
        await writeFileAtomic(file, text(t));
        process.stderr.write(`wrote ${t.rows.length} record(s) of layout ${printable(layout)} to ${printable(file)}\n`);
      }
    });
}
