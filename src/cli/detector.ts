import path from 'node:path';
import type { Command } from 'commander';
import { loadDetector } from '../detect/onnx-detector.js';
import { configError } from '../errors.js';
import { loadCocoDataset } from '../eval/detection-dataset.js';
import { evaluateDetector } from '../eval/detection-run.js';
import { formatDetectorEval } from '../eval/detection-table.js';
import { prPlotPng } from '../eval/pr-plot.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../models.js';
import { optionalWholeNumber } from './whole-number.js';

interface EvalOptions {
  model: string;
  data: string;
  out?: string;
  scoreThreshold?: string;
  threads?: string;
}

/** `formglean detector eval`: per-class AP of a detector on a labeled COCO set, with a precision–recall plot. */
export function registerDetectorCommand(program: Command): void {
  const detector = program.command('detector').description('Work with the form-element detector');
  detector
    .command('eval')
    .description('Score a detector on a labeled COCO set: per-class AP@0.5, AP@0.5:0.95, precision and recall')
    .option('--model <file>', 'ONNX detector (default: the shipped form-element detector)', DEFAULT_MODEL_PATH)
    .requiredOption('--data <file>', 'COCO JSON (image paths relative to it), e.g. from samples generate')
    .option('--out <dir>', 'where to write detector-eval.json and detector-pr.png (default: detector-eval/ beside the data)')
    .option('--score-threshold <t>', 'operating threshold for precision/recall (default: the model\'s own, else 0.25)')
    .option('--threads <n>', 'onnxruntime intra-op threads (default: onnxruntime\'s choice)')
    .action(async (opts: EvalOptions) => {
      const scoreThreshold = opts.scoreThreshold === undefined ? undefined : fraction('--score-threshold', opts.scoreThreshold);
      const intraOpThreads = optionalWholeNumber('--threads', opts.threads);
      const det = await loadDetector(opts.model, { intraOpThreads });
      const data = await loadCocoDataset(opts.data);
      const report = await evaluateDetector(det, data, {
        scoreThreshold,
        onImage: process.stderr.isTTY ? (done, total) => process.stderr.write(`\rimage ${done}/${total}`) : undefined,
      });
      if (process.stderr.isTTY) process.stderr.write('\n');
      const out = opts.out ?? path.join(path.dirname(data.file), 'detector-eval');
      const json = path.join(out, 'detector-eval.json');
      const png = path.join(out, 'detector-pr.png');
      await writeJsonAtomic(json, report);
      const curves = report.classes.map((c) => ({ name: c.name, precision: c.curve, ap50: c.ap50 }));
      await writeFileAtomic(png, await prPlotPng(curves, `Precision–recall: ${det.id}`));
      process.stdout.write(formatDetectorEval(report));
      process.stdout.write(`wrote ${json} and ${png}\n`);
      await det.close();
    });
}

function fraction(option: string, text: string): number {
  const v = Number(text);
  if (!(v > 0 && v < 1)) throw configError(undefined, `${option} expects a number between 0 and 1, got "${text}"`);
  return v;
}

