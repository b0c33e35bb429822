import { stat } from 'node:fs/promises';
import path from 'node:path';
import type { Command } from 'commander';
import { defaultWorkers, runBatch } from '../batch/run-batch.js';
import { loadDetector } from '../detect/onnx-detector.js';
import { configError, printable } from '../errors.js';
import { DEFAULT_MODEL_PATH } from '../models.js';
import { OcrEngine } from '../read/ocr-engine.js';
import { DEFAULT_DIGIT_MODEL_PATH, DigitReader } from '../read/digit-reader.js';
import { checkReferenceImages } from '../schema/blank-images.js';
import { checkSchemaAgainstClasses } from '../schema/consistency.js';
import { loadSchemas } from '../schema/load-many.js';
import type { LoadedSchema } from '../schema/load.js';
import type { Detector } from '../detect/types.js';
import type { BatchSummary } from '../results/summary.js';
import { BatchProgress, type ProgressMode } from './progress.js';
import { optionalWholeNumber } from './whole-number.js';

interface ExtractCliOptions {
  schema: string[];
  model: string;
  out: string;
  resume?: boolean;
  deskew: boolean;
  orientation: boolean;
  dropout?: boolean;
  digitModel: string;
  digitReader: boolean;
  threads?: string;
  workers?: string;
  quiet?: boolean;
  jsonLog?: boolean;
}

/** Exit status of a run stopped by a signal: 128 + the signal's number, as POSIX shells report it (common practice). */
const SIGNAL_EXIT: Record<'SIGINT' | 'SIGTERM', number> = { SIGINT: 130, SIGTERM: 143 };

/**
 * Ctrl-C (or SIGTERM) once: no new input starts, the ones in progress finish, the index and the review queue are
 * written. Twice: stop at once (every finished input is already in the folder's journal, which the next run or
 * reader replays).
 */
function stopOnSignals(progress: () => BatchProgress | null): { signal: AbortSignal; received: () => 'SIGINT' | 'SIGTERM' | null; release: () => void } {
  const stop = new AbortController();
  let first: 'SIGINT' | 'SIGTERM' | null = null;
  const on = (sig: 'SIGINT' | 'SIGTERM') => {
    if (first === null) {
      first = sig;
      stop.abort();
      const text = `${sig}: finishing the documents in progress, then writing the index and the review queue (press Ctrl-C again to stop at once)`;
      const p = progress();
      if (p) p.note('stopping', text);
      else process.stderr.write(`${text}\n`);
      return;
    }
    process.stderr.write(`${sig} again: stopped at once; finished documents are in the results folder's journal, run again with --resume to go on\n`);
    process.exit(SIGNAL_EXIT[first]);
  };
  const onInt = () => on('SIGINT');
  const onTerm = () => on('SIGTERM');
  process.on('SIGINT', onInt);
  process.on('SIGTERM', onTerm);
  return {
    signal: stop.signal,
    received: () => first,
    release: () => {
      process.off('SIGINT', onInt);
      process.off('SIGTERM', onTerm);
    },
  };
}

export function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

/** A required --schema option, loaded, each schema's blank reference images found: the checks before any reading. */
export async function loadSchemasChecked(paths: readonly string[], command: string): Promise<LoadedSchema[]> {
  if (paths.length === 0) throw configError(undefined, `${command}: --schema <file> is required (a schema file or a folder of them)`);
  const schemas = await loadSchemas(paths);
  for (const s of schemas) {
    const missing = await checkReferenceImages(s);
    if (missing.length > 0) throw configError(s.path, missing[0]);
  }
  return schemas;
}

/** Every field class a schema names is one the detector knows. */
export function checkSchemasAgainstDetector(schemas: readonly LoadedSchema[], detector: Detector): void {
  for (const s of schemas) {
    const problems = checkSchemaAgainstClasses(s.schema, detector.classNames);
    if (problems.length > 0) throw configError(s.path, problems[0]);
  }
}

/** The one-line summary of a batch that extract and queue collect print; `speed` adds this run's pages/s. */
export function summaryText(s: BatchSummary, out: string, speed?: { pagesPerSecond: number | null; workers: number }): string {
  const rate = speed ? `, ${speed.pagesPerSecond ?? '-'} pages/s with ${speed.workers} worker(s)` : '';
  return (
    `${s.documents.processed} of ${s.documents.total} documents processed, ${s.fields.total} fields: ` +
    `${s.fields.byStatus.accepted} accepted, ${s.fields.byStatus.review} review, ${s.fields.byStatus.invalid} invalid, ` +
    `${s.fields.byStatus.missing} missing; straight through: ${percent(s.straightThroughRate)} of fields, ` +
    `${percent(s.documentStraightThroughRate)} of documents; ${s.secondsPerPage ?? '-'} s/page${rate}. Results in ${printable(out)}\n`
  );
}

/** Share as a whole percentage, or '-' when there is nothing to count. */
function percent(share: number | null): string {
  return share === null ? '-' : `${Math.round(share * 100)} %`;
}

/** What every command that reads forms takes: the inputs, the schemas and model, and how pages are read. */
export function readingOptions(cmd: Command): Command {
  return cmd
    .argument('<inputs...>', 'scans (png, jpeg, tiff, webp, pdf), folders or glob patterns')
    .option('--schema <file>', 'form schema (YAML or JSON), or a folder of them; repeat for several layouts', collect, [])
    .option('--model <file>', 'ONNX form-element detector', DEFAULT_MODEL_PATH)
    .requiredOption('--out <dir>', 'results folder')
    .option('--no-deskew', 'do not correct small page skew')
    .option('--no-orientation', 'do not look for pages turned by 90, 180 or 270 degrees')
    .option('--dropout', 'read text with the printed form subtracted (needs the schema\'s blank image; 1-2 s more per page)')
    .option('--digit-model <file>', 'ONNX digit reader for digit combs (read beside Tesseract, cell by cell)', DEFAULT_DIGIT_MODEL_PATH)
    .option('--no-digit-reader', 'read digit combs with Tesseract alone');
}

export function registerExtractCommand(program: Command): void {
  readingOptions(program.command('extract').description('Read scanned forms into checked JSON records, a review queue and a summary'))
    .option('--resume', 'keep results of documents unchanged since the last run')
    .option('--workers <n>', `worker threads, each with its own detector and OCR worker and reading two inputs at once (one in OCR while the other is levelled and registered) (default: one per core as memory allows, ${defaultWorkers()} here)`)
    .option('--threads <n>', 'onnxruntime intra-op threads of each detector session (default: the cores shared out among the workers)')
    .option('--quiet', 'print only the summary')
    .option('--json-log', 'progress as one JSON object per event on stderr (never field values)')
    .action(async (inputs: string[], opts: ExtractCliOptions) => {
      const threads = optionalWholeNumber('--threads', opts.threads);
      const workers = optionalWholeNumber('--workers', opts.workers) ?? defaultWorkers();
      if (opts.quiet && opts.jsonLog) throw configError(undefined, 'extract: --quiet and --json-log cannot be given together');
      const outStat = await stat(opts.out).catch(() => null);
      const schemas = await loadSchemasChecked(opts.schema, 'extract');
      if (outStat && !outStat.isDirectory()) throw configError(opts.out, 'the --out path exists and is not a folder');
      const detector = await loadDetector(opts.model, { intraOpThreads: threads });
      checkSchemasAgainstDetector(schemas, detector);
      const digitReader = opts.digitReader ? await DigitReader.open(opts.digitModel) : undefined;
      // Started on the first read: with worker threads, each opens its own and this one stays idle.
      const ocr = new OcrEngine();
      const mode: ProgressMode = opts.quiet ? 'quiet' : opts.jsonLog ? 'json' : process.stderr.isTTY ? 'tty' : 'lines';
      let progress = null as BatchProgress | null;
      const stop = stopOnSignals(() => progress);
      try {
        const report = await runBatch({
          inputs,
          schemas,
          detector,
          ocr,
          outDir: opts.out,
          resume: opts.resume,
          deskew: opts.deskew,
          orientation: opts.orientation,
          dropout: opts.dropout,
          digitReader,
          workers,
          threadsPerWorker: threads,
          signal: stop.signal,
          onStart: (e) => (progress = new BatchProgress(mode, e.inputs, e.workers)),
          onInput: (e) => progress?.input(e),
        });
        const s = report.summary;
        const r = report.run;
        progress?.finish({ interrupted: r.interrupted, wallSeconds: r.wallSeconds, documents: s.documents });
        const signal = stop.received();
        if (signal && r.interrupted) {
          process.stderr.write(
            `interrupted by ${signal}: ${r.inputs.notReached} of ${r.inputs.total} input(s) not started; the index and the review queue ` +
              `list what was read; run the same command with --resume to go on\n`,
          );
        } else if (signal) {
          process.stderr.write(`${signal} came when every input had already started: the run is complete\n`);
        }
        process.stdout.write(summaryText(s, opts.out, r));
        // Inputs found in folders but not tried are listed in results.jsonl and summary.json with their reasons.
        const skipped = report.lines.filter((l) => l.skipped !== undefined);
        if (skipped.length > 0) {
          process.stderr.write(`${skipped.length} input(s) skipped:\n`);
          for (const l of skipped) process.stderr.write(`  ${printable(path.relative(process.cwd(), l.path) || l.path)}: ${printable(l.skipped ?? '')}\n`);
        }
        if (s.documents.failed > 0) process.exitCode = 1;
        if (signal && r.interrupted) process.exitCode = SIGNAL_EXIT[signal];
      } finally {
        stop.release();
        progress?.finish({});
        await detector.close();
        await digitReader?.close();
        await ocr.close();
      }
    });
}
