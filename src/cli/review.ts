import type { Command } from 'commander';
import { printable } from '../errors.js';
import { applyReviewQueue, type ApplyReport } from '../review/apply.js';
import { readResultsFolder } from '../review/result-store.js';
import { reviewStatus } from '../review/status.js';
import { formatTable } from '../review/text-table.js';

function printApplyReport(queue: string, r: ApplyReport): void {
  const applied = r.corrected + r.confirmed;
  process.stdout.write(
    `applied ${applied} answer(s) to ${r.documentsWritten} document(s): ${r.corrected} corrected, ${r.confirmed} confirmed; ` +
      `${r.alreadyApplied} already applied; ${r.unanswered} row(s) without an answer\n`,
  );
  if (r.auditRecovered > 0) process.stdout.write(`audit: ${r.auditRecovered} entry(ies) recovered from an earlier run that was cut off\n`);
  for (const s of r.changedSchemas) process.stderr.write(`warning: ${printable(s)}: schema changed since extraction; corrections were checked with the current file\n`);
  if (r.extraColumns.length > 0) process.stdout.write(`ignored column(s): ${printable(r.extraColumns.join(', '))}\n`);
  // One line per refused row: the queue file and line, never the field's value.
  for (const p of r.problems) process.stderr.write(`${printable(queue)}:${p.line}: ${printable(p.message)}\n`);
  if (r.problems.length > 0) process.stderr.write(`${r.problems.length} row(s) not applied\n`);
}

/** `formglean review apply|status`: bring a person's answers from the review queue back into the results. */
export function registerReviewCommand(program: Command): void {
  const review = program.command('review').description('Apply a reviewed queue, and see where review stands');

  review
    .command('apply')
    .description('Apply corrections and confirmations typed into a review queue (CSV) to the results')
    .argument('<queue>', 'the reviewed queue, e.g. DIR/review/queue.csv')
    .requiredOption('--results <dir>', 'the extract output folder the queue came from')
    .option('--reviewer <name>', 'who reviewed (default: FORMGLEAN_REVIEWER, then USER)')
    .action(async (queue: string, opts: { results: string; reviewer?: string }) => {
      const report = await applyReviewQueue(queue, opts.results, { reviewer: opts.reviewer });
      printApplyReport(queue, report);
      if (report.problems.length > 0) process.exitCode = 1;
    });

  review
    .command('status')
    .description('Pending, corrected and confirmed field counts per field and per document')
    .requiredOption('--results <dir>', 'the extract output folder')
    .option('--json', 'print the counts as JSON')
    .action(async (opts: { results: string; json?: boolean }) => {
      const folder = await readResultsFolder(opts.results);
      const s = reviewStatus(folder.documents.map((d) => d.result));
      if (opts.json) {
        process.stdout.write(JSON.stringify(s, null, 2) + '\n');
        return;
      }
      const head = ['pending', 'corrected', 'confirmed'] as const;
      const out = [
        formatTable(['field', ...head], s.byField.map((r) => [r.field, ...head.map((k) => r[k])])),
        '',
        formatTable(['document', ...head], s.byDocument.map((r) => [r.document, ...head.map((k) => r[k])])),
        '',
        `total: ${s.total.pending} pending, ${s.total.corrected} corrected, ${s.total.confirmed} confirmed in ${s.byDocument.length} document(s)`,
      ];
      process.stdout.write(out.join('\n') + '\n');
    });
}
