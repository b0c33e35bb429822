import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Command } from 'commander';
import { configError, documentError } from '../errors.js';
import { decodeDocument } from '../input/decode.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import type { LegendEntry, OverlayItem } from '../page/overlay.js';
import { renderOverlay } from '../page/overlay.js';
import { DocumentResult, FieldStatus } from '../result/document.js';
import type { FieldResult } from '../result/document.js';
import { asConfigError, readResultsRecord } from '../results/document-record.js';

/** Frame colours per status: a colour-blind-safe set (Okabe & Ito, "Color Universal Design", 2008) plus gray. */
export const STATUS_COLOURS: Record<FieldStatus, string> = {
  accepted: '#009E73',
  review: '#E69F00',
  invalid: '#D55E00',
  missing: '#7F7F7F',
  corrected: '#0072B2',
  confirmed: '#56B4E9',
};

function captionValue(f: FieldResult): string {
  const v = f.value;
  if (v === null) return '∅';
  const s = Array.isArray(v) ? v.join(', ') : String(v);
  return s.length > 40 ? `${s.slice(0, 39)}…` : s;
}

/** Overlay items for one page of a result; values only when asked (forms carry personal data). */
export function resultOverlayItems(result: DocumentResult, page: number, showValues: boolean): OverlayItem[] {
  return result.fields
    .filter((f) => f.box !== null && f.box.page === page)
    .map((f) => {
      const b = f.box!;
      const caption = `${f.name} · ${f.status} ${Math.round(f.confidence * 100)}%${showValues ? ` = ${captionValue(f)}` : ''}`;
      return { box: { x: b.x, y: b.y, w: b.w, h: b.h }, colour: STATUS_COLOURS[f.status], caption, dashed: f.source !== 'detection' };
    });
}

export function statusLegend(result: DocumentResult): LegendEntry[] {
  return FieldStatus.options
    .filter((s) => result.counts[s] > 0)
    .map((s) => ({ colour: STATUS_COLOURS[s], text: `${s} ${result.counts[s]}` }))
    .concat([{ colour: '#404040', text: 'dashed: schema region' }]);
}

/** The record named on the command line: a bad one is a usage error (exit code 2). */
async function readResult(file: string): Promise<DocumentResult> {
  return readResultsRecord(file).catch((err: unknown) => {
    throw asConfigError(err);
  });
}

/** Where the scanned document is: an explicit --document, else the result's path as written or beside the result. */
async function locateDocument(resultFile: string, result: DocumentResult, override?: string): Promise<string> {
  const candidates = override
    ? [override]
    : path.isAbsolute(result.document.path)
      ? [result.document.path]
      : [path.resolve(result.document.path), path.resolve(path.dirname(resultFile), result.document.path)];
  for (const c of candidates) {
    try {
      const bytes = await readFile(c);
      const sha = createHash('sha256').update(bytes).digest('hex');
      if (sha !== result.document.sha256) throw documentError(c, 'differs from the document the result was made from (sha256 mismatch)');
      return c;
    } catch (err) {
      if (err instanceof Error && err.name === 'FormgleanError') throw err;
    }
  }
  throw documentError(resultFile, `document "${result.document.path}" not found (give it with --document)`);
}

/**
 * The page of the file that holds a record's form page: a file with a stack of forms gives each form its own record
 * (doc.p2, doc.p3, ...), whose pages name their place in the file (filePage); the boxes are in that page's pixels.
 */
export function recordFilePage(resultFile: string, result: DocumentResult, page: number): number {
  const p = result.pages.find((x) => x.index === page);
  if (!p) throw configError(resultFile, `--page ${page + 1} asked, but the record has ${result.pages.length} page(s)`);
  return p.filePage ?? p.index;
}

/** `formglean overlay RESULT.json --out page.png`: draw located fields, statuses and (on request) values. */
export function registerOverlayCommand(program: Command): void {
  program
    .command('overlay')
    .description('Draw the located fields of a document result, coloured by status, on the page image')
    .argument('<result>', 'document result JSON written by extract')
    .requiredOption('--out <png>', 'PNG to write')
    .option('--page <n>', "page of the record's form, from 1 (a record of a form stacked in a larger file finds its own page in the file)", '1')
    .option('--document <file>', 'the scanned document, when it is no longer where the result says')
    .option('--show-values', 'print field values beside the boxes (forms carry personal data: off by default)', false)
    .action(async (resultFile: string, opts: { out: string; page: string; document?: string; showValues: boolean }) => {
      // People count pages from 1 (as every --page does); the record's page indexes count from 0.
      const pageNumber = Number(opts.page);
      if (!Number.isInteger(pageNumber) || pageNumber < 1) throw configError(undefined, `--page must be a page number from 1; got "${opts.page}"`);
      const page = pageNumber - 1;
      const result = await readResult(resultFile);
      const filePage = recordFilePage(resultFile, result, page);
      const docFile = await locateDocument(resultFile, result, opts.document);
      const doc = await decodeDocument(docFile);
      if (filePage >= doc.pages.length) throw configError(docFile, `the record's page ${pageNumber} is page ${filePage + 1} of the file, but the file has ${doc.pages.length} page(s)`);
      const items = resultOverlayItems(result, page, opts.showValues);
      const png = await renderOverlay(doc.pages[filePage], items, statusLegend(result));
      await writeFileAtomic(opts.out, png);
      const where = filePage !== page ? ` (page ${filePage + 1} of ${path.basename(docFile)})` : '';
      process.stdout.write(`${opts.out}: ${items.length} field boxes on page ${pageNumber}${where}${opts.showValues ? ' (with values)' : ''}\n`);
    });
}
