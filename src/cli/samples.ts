import type { Command } from 'commander';
import { configError } from '../errors.js';
import { writeDemoSchema } from '../synth/demo-assets.js';
import { generateSamples } from '../synth/generate.js';
import type { PageFormat } from '../synth/encode-page.js';
import type { FillMode } from '../synth/fill.js';
import { isDemoLayout, isLayoutName, LAYOUT_NAMES } from '../synth/layouts.js';
import type { DegradeLevel } from '../synth/scan-params.js';
import type { StyleSelection } from '../synth/style-families.js';

interface GenerateFlags {
  layout: string;
  count: string;
  seed: string;
  out: string;
  fill: string;
  degrade: string;
  dpi?: string;
  styles: string;
  format: string;
  upsideDown: string;
  blank?: boolean;
  realDigits?: boolean;
}

function oneOf<T extends string>(flag: string, value: string, allowed: readonly T[]): T {
  if (!(allowed as readonly string[]).includes(value)) throw configError(undefined, `--${flag} must be one of ${allowed.join(', ')}; got "${value}"`);
  return value as T;
}

function integer(flag: string, value: string, min: number, max: number): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < min || n > max) throw configError(undefined, `--${flag} must be an integer from ${min} to ${max}; got "${value}"`);
  return n;
}

/** A page counter on an interactive terminal. */
function progress(count: string): (index: number) => void {
  return (i) => {
    if (process.stderr.isTTY) process.stderr.write(`\rpage ${i + 1}/${count}${i + 1 === Number(count) ? '\n' : ''}`);
  };
}

function reportWritten(s: { pages: number; annotations: number; seconds: number }, where: string): void {
  process.stdout.write(`wrote ${s.pages} pages, ${s.annotations} boxes ${where} in ${s.seconds.toFixed(1)} s (${((s.seconds / s.pages) * 1000).toFixed(0)} ms/page)\n`);
}

/** `formglean samples generate`: invented filled forms with exact labels, for tests, demos and detector training. */
export function registerSamplesCommand(program: Command): void {
  const samples = program.command('samples').description('Synthetic filled forms with labels (COCO boxes and field truth)');
  samples
    .command('generate')
    .description('Write pages, coco.json and truth/<stem>.json for a layout')
    .requiredOption('--layout <name>', `layout: ${LAYOUT_NAMES.join(', ')}`)
    .requiredOption('--out <dir>', 'output folder')
    .option('--count <n>', 'number of pages', '10')
    .option('--seed <n>', 'run seed (training 1..99999, evaluation >= 900000)', '1')
    .option('--fill <mode>', 'typed | handwriting | mixed | blank', 'typed')
    .option('--degrade <level>', 'scan simulation: none | light | heavy', 'light')
    .option('--dpi <n>', 'output resolution (default: reference 200 DPI; heavy draws 150..300)')
    .option('--styles <set>', 'random layouts: train | heldout | all style families', 'train')
    .option('--format <fmt>', 'png | jpeg | tiff', 'png')
    .option('--upside-down <rate>', 'share of pages fed upside down when degrading', '0.03')
    .option('--real-digits', 'write digits in comb boxes as real handwriting (MNIST test split; needs the dev dependency mnist)')
    .option('--blank', 'also write the blank reference <layout>.blank.png and its schema <layout>.yaml (demo layouts)')
    .action(async (flags: GenerateFlags) => {
      if (!isLayoutName(flags.layout)) throw configError(undefined, `--layout must be one of ${LAYOUT_NAMES.join(', ')}; got "${flags.layout}"`);
      if (flags.blank) {
        if (!isDemoLayout(flags.layout)) throw configError(undefined, '--blank needs a demo layout: random layouts change with every page (use --fill blank)');
        const r = await writeDemoSchema(flags.layout, flags.out);
        process.stdout.write(`wrote ${r.blank} and ${r.schema}\n`);
      }
      const rate = Number(flags.upsideDown);
      if (!(rate >= 0 && rate <= 1)) throw configError(undefined, `--upside-down must be a share from 0 to 1; got "${flags.upsideDown}"`);
      const summary = await generateSamples(
        {
          layout: flags.layout,
          count: integer('count', flags.count, 1, 1_000_000),
          seed: integer('seed', flags.seed, 0, 2 ** 32 - 1),
          out: flags.out,
          fill: oneOf<FillMode | 'mixed'>('fill', flags.fill, ['typed', 'handwriting', 'mixed', 'blank']),
          degrade: oneOf<DegradeLevel>('degrade', flags.degrade, ['none', 'light', 'heavy']),
          dpi: flags.dpi === undefined ? undefined : integer('dpi', flags.dpi, 72, 600),
          styles: oneOf<StyleSelection>('styles', flags.styles, ['train', 'heldout', 'all']),
          format: oneOf<PageFormat>('format', flags.format, ['png', 'jpeg', 'tiff']),
          upsideDownRate: rate,
          realDigits: flags.realDigits,
        },
        progress(flags.count),
      );
      reportWritten(summary, `to ${flags.out}`);
    });

  samples
    .command('fill')
    .description('Fill a fillable PDF form with invented values: pages, truth/<stem>.json, coco.json and the drafted schema')
    .argument('<form>', 'fillable PDF (AcroForm)')
    .requiredOption('--out <dir>', 'output folder')
    .option('--count <n>', 'number of pages', '10')
    .option('--seed <n>', 'run seed', '1')
    .option('--page <n>', 'page of the PDF, from 1', '1')
    .option('--fill <mode>', 'typed | handwriting | mixed (every other page typed)', 'mixed')
    .option('--degrade <level>', 'scan simulation: none | light | heavy', 'light')
    .option('--upside-down <rate>', 'share of pages fed upside down when degrading', '0')
    .option('--real-digits', 'on handwriting pages, write digits in comb boxes and digit-only fields as real handwriting (MNIST test split; needs the dev dependency mnist)')
    .action(async (form: string, flags: { out: string; count: string; seed: string; page: string; fill: string; degrade: string; upsideDown: string; realDigits?: boolean }) => {
      const rate = Number(flags.upsideDown);
      if (!(rate >= 0 && rate <= 1)) throw configError(undefined, `--upside-down must be a share from 0 to 1; got "${flags.upsideDown}"`);
      // Loaded on use: the PDF library is large, and every other command starts without it.
      const { fillPdfSamples } = await import('../synth/pdf-fill/fill-pdf.js');
      const summary = await fillPdfSamples(
        {
          form,
          page: integer('page', flags.page, 1, 10_000) - 1,
          count: integer('count', flags.count, 1, 1_000_000),
          seed: integer('seed', flags.seed, 0, 2 ** 32 - 1),
          out: flags.out,
          fill: oneOf('fill', flags.fill, ['typed', 'handwriting', 'mixed'] as const),
          degrade: oneOf<DegradeLevel>('degrade', flags.degrade, ['none', 'light', 'heavy']),
          upsideDownRate: rate,
          realDigits: flags.realDigits,
        },
        progress(flags.count),
      );
      reportWritten(summary, `and ${summary.schema} to ${flags.out}`);
    });
}
