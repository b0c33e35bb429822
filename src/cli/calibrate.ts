import type { Command } from 'commander';
import { DEFAULT_MIN_SAMPLES, runCalibrate, type CalibrateOptions } from '../eval/calibration-run.js';
import { formatCalibration } from '../eval/calibration-table.js';

/** `formglean calibrate`: per-field review thresholds from labeled results, written into a copy of the schema. */
export function registerCalibrateCommand(program: Command): void {
  program
    .command('calibrate')
    .description('Fit confidence to observed accuracy and propose per-field review thresholds for a target error')
    .requiredOption('--results <dir>', 'folder written by extract (with review answers applied, when no --truth)')
    .option('--truth <dir>', 'folder written by samples generate (truth/<stem>.json); without it, the labels are the fields a person reviewed in --results (confirmed: right, corrected: wrong)')
    .requiredOption('--schema <file>', 'the schema the results were read with (YAML or JSON)')
    .option('--target-error <share>', 'highest share of wrong values among accepted fields', (v) => Number(v), 0.005)
    .option('--out <file>', 'calibrated copy of the schema (default <schema>.calibrated.<ext>)')
    .option('--map <file>', 'also write the fitted confidence-to-accuracy maps as JSON')
    .option('--min-samples <n>', 'fewest samples for a field to get its own map', (v) => Number(v), DEFAULT_MIN_SAMPLES)
    .action(
      async (opts: CalibrateOptions) => {
        const run = await runCalibrate(opts);
        process.stdout.write(formatCalibration(run));
        process.stdout.write(`\nwrote ${run.out}${opts.map ? ` and ${opts.map}` : ''}\n`);
      },
    );
}
