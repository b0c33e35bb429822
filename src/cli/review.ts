import type { Command } from 'commander';
import { configError, printable } from '../errors.js';
import { applyReviewQueue, type ApplyReport } from '../review/apply.js';
import { queuePath } from '../results/review-layout.js';
import { startReviewPage } from '../review/page/server.js';
import { writeReviewQueue } from '../review/queue-write.js';
import { reasonsMarkdown, reasonsText } from '../review/reasons-text.js';
import { readResultsFolder } from '../review/result-store.js';
import { reviewStatus, type ReviewStatus } from '../review/status.js';
import { formatTable } from '../io/text-table.js';

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

const HEAD = ['pending', 'corrected', 'confirmed'] as const;

function statusText(s: ReviewStatus): string {
  const out: string[] = [];
  for (const l of s.byLayout) {
    out.push(`layout ${l.layout}: ${l.documents} document(s), ${l.documentsDone} with nothing waiting`);
    if (l.fields.length > 0) out.push(formatTable(['field', ...HEAD], l.fields.map((r) => [r.field, ...HEAD.map((k) => r[k])])));
    else out.push('no field went to review');
    out.push('');
  }
  const waiting = s.byDocument.filter((d) => d.pending > 0);
  if (waiting.length > 0) {
    out.push(formatTable(['document still waiting', 'layout', ...HEAD], waiting.map((r) => [r.document, r.layout, ...HEAD.map((k) => r[k])])));
    out.push('');
  }
  if (s.layoutQuestions.length > 0) {
    out.push(`document(s) of unknown layout, waiting for a person to say which form they are: ${s.layoutQuestions.join(', ')}`);
    out.push('');
  }
  for (const d of s.setAside) {
    out.push(
      d.schema !== undefined
        ? `${d.document}: set aside as form ${d.schema}; extract --resume with that schema among --schema reads it again as such`
        : `${d.document}: set aside as none of the forms`,
    );
  }
  if (s.setAside.length > 0) out.push('');
  const docs = s.byLayout.reduce((n, l) => n + l.documents, 0);
  out.push(`total: ${s.total.pending} pending, ${s.total.corrected} corrected, ${s.total.confirmed} confirmed in ${docs} document(s)`);
  return out.join('\n') + '\n';
}

function port(text: string): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw configError(undefined, `--port must be a port number 0..65535; got "${text}"`);
  return n;
}

/** `formglean review ...`: bring a person's answers back into the results, and see where review stands. */
export function registerReviewCommand(program: Command): void {
  const review = program
    .command('review')
    .description('Review doubtful fields: on a local page or in the CSV queue; see where review stands')
    .addHelpText('after', `\nReason codes (why a field waits for review):\n${reasonsText()}\n`);

  review
    .command('serve')
    .description('Serve the review page of a results folder on 127.0.0.1: one field at a time, keyboard first')
    .requiredOption('--results <dir>', 'the extract output folder')
    .option('--port <n>', 'port on 127.0.0.1 (default: a free one)', '0')
    .option('--reviewer <name>', 'who reviews (default: FORMGLEAN_REVIEWER, then USER)')
    .action(async (opts: { results: string; port: string; reviewer?: string }) => {
      const page = await startReviewPage({ resultsDir: opts.results, port: port(opts.port), reviewer: opts.reviewer });
      // The address holds the page's secret: print it for the person at this terminal only.
      process.stdout.write(`review page for ${printable(opts.results)} (this computer only):\n  ${page.url}\nopen it in a browser; Ctrl+C stops the page, every answer is already saved\n`);
      await new Promise<void>((resolve) => {
        const stop = () => void page.close().then(resolve);
        process.once('SIGINT', stop);
        process.once('SIGTERM', stop);
      });
    });

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
    .command('queue')
    .description('Write DIR/review/queue.csv afresh from the records: the fields still waiting, answers typed for unchanged rows kept')
    .requiredOption('--results <dir>', 'the extract output folder')
    .action(async (opts: { results: string }) => {
      const folder = await readResultsFolder(opts.results);
      const results = folder.documents.map((d) => d.result);
      const rows = await writeReviewQueue(opts.results, results);
      process.stdout.write(`${printable(queuePath(opts.results))}: ${rows} row(s) from ${results.length} document(s)\n`);
    });

  review
    .command('status')
    .description('Pending, corrected and confirmed counts per layout, for the fields that went to review')
    .requiredOption('--results <dir>', 'the extract output folder')
    .option('--json', 'print the counts as JSON')
    .action(async (opts: { results: string; json?: boolean }) => {
      const folder = await readResultsFolder(opts.results);
      const s = reviewStatus(folder.documents.map((d) => d.result));
      process.stdout.write(opts.json ? JSON.stringify(s, null, 2) + '\n' : statusText(s));
    });

  review
    .command('reasons')
    .description('List the reason codes: what each means and what the reviewer should check')
    .option('--markdown', 'as a Markdown table (the README\'s)')
    .action((opts: { markdown?: boolean }) => {
      process.stdout.write(opts.markdown ? reasonsMarkdown() : reasonsText() + '\n');
    });
}
