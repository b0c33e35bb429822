import { stat } from 'node:fs/promises';
import path from 'node:path';
import type { Command } from 'commander';
import { runBatch } from '../batch/run-batch.js';
import { loadDetector } from '../detect/onnx-detector.js';
import { configError, printable } from '../errors.js';
import { DEFAULT_MODEL_PATH } from '../models.js';
import { closeSharedOcrEngine } from '../read/ocr-engine.js';
import { DEFAULT_DIGIT_MODEL_PATH, DigitReader } from '../read/digit-reader.js';
import { checkReferenceImages, checkSchemaAgainstClasses } from '../schema/consistency.js';
import { loadSchemas } from '../schema/load-many.js';
import type { LoadedSchema } from '../schema/load.js';
import type { Detector } from '../detect/types.js';
import type { BatchSummary } from '../results/summary.js';

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
  quiet?: boolean;
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

/** The one-line summary of a batch that extract and queue collect print. */
export function summaryText(s: BatchSummary, out: string): string {
  return (
    `${s.documents.processed} of ${s.documents.total} documents processed, ${s.fields.total} fields: ` +
    `${s.fields.byStatus.accepted} accepted, ${s.fields.byStatus.review} review, ${s.fields.byStatus.invalid} invalid, ` +
    `${s.fields.byStatus.missing} missing; straight through: ${percent(s.straightThroughRate)} of fields, ` +
    `${percent(s.documentStraightThroughRate)} of documents; ${s.secondsPerPage ?? '-'} s/page. Results in ${printable(out)}\n`
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
    .option('--threads <n>', 'onnxruntime intra-op threads')
    .option('--quiet', 'print only the summary')
    .action(async (inputs: string[], opts: ExtractCliOptions) => {
      const threads = opts.threads === undefined ? undefined : Number(opts.threads);
      if (threads !== undefined && (!Number.isInteger(threads) || threads < 1)) {
        throw configError(undefined, `--threads: expected a whole number >= 1 but received "${opts.threads}"`);
      }
      const outStat = await stat(opts.out).catch(() => null);
      const schemas = await loadSchemasChecked(opts.schema, 'extract');
      if (outStat && !outStat.isDirectory()) throw configError(opts.out, 'the --out path exists and is not a folder');
      const detector = await loadDetector(opts.model, { intraOpThreads: threads });
      checkSchemasAgainstDetector(schemas, detector);
      const digitReader = opts.digitReader ? await DigitReader.open(opts.digitModel) : undefined;
      try {
        const report = await runBatch({
          inputs,
          schemas,
          detector,
          outDir: opts.out,
          resume: opts.resume,
          deskew: opts.deskew,
          orientation: opts.orientation,
          dropout: opts.dropout,
          digitReader,
          onDocument: (e) => {
            if (opts.quiet) return;
            const name = printable(path.relative(process.cwd(), e.file) || e.file);
            const l = e.line;
            const what = l.ok
              ? `${(l.counts?.accepted ?? 0)} accepted, ${(l.counts?.review ?? 0) + (l.counts?.invalid ?? 0) + (l.counts?.missing ?? 0)} to review${e.reused ? ' (unchanged, kept)' : ''} in ${l.seconds?.toFixed(1)} s`
              : `FAILED: ${printable(l.error ?? '')}`;
            process.stderr.write(`[${e.index + 1}/${e.total}] ${name}: ${what}\n`);
          },
        });
        const s = report.summary;
        process.stdout.write(summaryText(s, opts.out));
        // Inputs found in folders but not tried are listed in results.jsonl and summary.json with their reasons.
        const skipped = report.lines.filter((l) => l.skipped !== undefined);
        if (skipped.length > 0) {
          process.stderr.write(`${skipped.length} input(s) skipped:\n`);
          for (const l of skipped) process.stderr.write(`  ${printable(path.relative(process.cwd(), l.path) || l.path)}: ${printable(l.skipped ?? '')}\n`);
        }
        if (s.documents.failed > 0) process.exitCode = 1;
      } finally {
        await detector.close();
        await digitReader?.close();
        await closeSharedOcrEngine();
      }
    });
}
