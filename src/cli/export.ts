import type { Command } from 'commander';
import { Option } from 'commander';
import { printable } from '../errors.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { recordsCsv, recordsJsonl, recordTable } from '../review/export-table.js';
import { readResultsFolder } from '../review/result-store.js';
import { isFailed } from '../results/results-line.js';

/** `formglean export`: the checked records as one flat table for downstream systems. */
export function registerExportCommand(program: Command): void {
  program
    .command('export')
    .description('Write the records as one flat table: a row per document, a column per field')
    .requiredOption('--results <dir>', 'the extract output folder')
    .addOption(new Option('--format <format>', 'table format').choices(['csv', 'jsonl']).default('csv'))
    .option('--out <file>', 'write here (atomically) instead of to standard output')
    .option('--with-status', 'add a <field>.status column after each field')
    .option('--bom', 'start the CSV with a UTF-8 byte order mark (for spreadsheets)')
    .option('--no-formula-guard', 'do not prefix formula-like CSV cells with an apostrophe (for machine consumers)')
    .action(async (opts: { results: string; format: 'csv' | 'jsonl'; out?: string; withStatus?: boolean; bom?: boolean; formulaGuard: boolean }) => {
      const folder = await readResultsFolder(opts.results);
      const table = recordTable(folder.documents.map((d) => d.result), { withStatus: opts.withStatus });
      const text = opts.format === 'jsonl' ? recordsJsonl(table) : recordsCsv(table, { formulaGuard: opts.formulaGuard, bom: opts.bom ?? false });
      const failed = folder.lines.filter(isFailed).length;
      if (failed > 0) process.stderr.write(`${failed} failed document(s) have no record and are not exported\n`);
      if (opts.out) {
        await writeFileAtomic(opts.out, text);
        process.stderr.write(`wrote ${table.rows.length} record(s) to ${printable(opts.out)}\n`);
      } else {
        process.stdout.write(text);
      }
    });
}
