#!/usr/bin/env node
import { Command, CommanderError } from 'commander';
import { FormgleanError, oneLine } from '../errors.js';
import { registerCalibrateCommand } from './calibrate.js';
import { registerDetectorCommand } from './detector.js';
import { registerExtractCommand } from './extract.js';
import { registerSchemaCommand } from './schema.js';
import { addDraftSubcommand } from './schema-draft.js';
import { addFromPdfSubcommand } from './schema-from-pdf.js';
import { registerScoreCommand } from './score.js';
import { registerSamplesCommand } from './samples.js';
import { registerReviewCommand } from './review.js';
import { registerExportCommand } from './export.js';
import { registerOverlayCommand } from './overlay.js';
import { registerQueueCommand } from './queue.js';

const program = new Command();
program
  .name('formglean')
  .description('Turn scanned paper forms into checked, structured records, offline.')
  .version('0.1.0')
  .showHelpAfterError()
  .exitOverride();

// Commands register themselves, one file per command.
registerExtractCommand(program);
const schemaCommand = registerSchemaCommand(program);
addDraftSubcommand(schemaCommand);
addFromPdfSubcommand(schemaCommand);
registerScoreCommand(program);
registerCalibrateCommand(program);
registerDetectorCommand(program);
registerSamplesCommand(program);
registerReviewCommand(program);
registerExportCommand(program);
registerOverlayCommand(program);
registerQueueCommand(program);

async function main(): Promise<void> {
  try {
    await program.parseAsync(process.argv);
  } catch (err) {
    if (err instanceof CommanderError) {
      process.exitCode = err.exitCode === 0 ? 0 : 2;
      return;
    }
    process.stderr.write(`formglean: ${oneLine(err)}\n`);
    process.exitCode = err instanceof FormgleanError ? err.exitCode : 1;
  }
}

await main();
