import type { Command } from 'commander';
import { runScore, type ScoreOptions } from '../eval/score-run.js';
import { formatScore } from '../eval/score-table.js';

/** `formglean score`: compare extract results with the truth of a labeled sample set. */
export function registerScoreCommand(program: Command): void {
  program
    .command('score')
    .description('Compare extract results with labeled truth: accuracy, review efficiency, calibration')
    .requiredOption('--results <dir>', 'folder written by extract (<document>.json per document)')
    .requiredOption('--truth <dir>', 'folder written by samples generate (truth/<stem>.json)')
    .option('--out <file>', 'where to write score.json (default <results>/score.json)')
    .option('--diagram <file>', 'reliability diagram PNG (default beside score.json)')
    .option('--bins <n>', 'confidence bins for the reliability diagram and ECE', (v) => Number(v), 15)
    .option('--per-field', 'also print one row per field')
    .action(async (opts: ScoreOptions & { perField?: boolean }) => {
      const run = await runScore(opts);
      process.stdout.write(formatScore(run.report, { perField: opts.perField }));
      process.stdout.write(`\nwrote ${run.out} and ${run.diagram}\n`);
    });
}
