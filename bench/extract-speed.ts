/**
 * Whole-pipeline speed and memory: `extract` over generated pages of the three demo layouts (held-out seeds), with
 * all three schemas given so layout assignment is included. Prints seconds per page (median, p90, mean), the share of
 * fields accepted, and the process's peak resident memory.
 *
 *   npx tsx bench/extract-speed.ts [--count 6] [--seed 900700] [--degrade light] [--threads 1]
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { runBatch } from '../src/batch/run-batch.js';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { percentile } from '../src/eval/percentile.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { OcrEngine } from '../src/read/ocr-engine.js';
import { loadSchemas } from '../src/schema/load-many.js';
import { generateSamples } from '../src/synth/generate.js';
import type { DegradeLevel } from '../src/synth/scan-params.js';

// The run's OCR engine, closed at the end.
const ocr = new OcrEngine();

const { values: args } = parseArgs({
  options: {
    count: { type: 'string', default: '6' },
    seed: { type: 'string', default: '900700' },
    degrade: { type: 'string', default: 'light' },
    threads: { type: 'string', default: '1' },
    model: { type: 'string', default: DEFAULT_MODEL_PATH },
  },
});

const root = path.resolve(import.meta.dirname, '..');
const count = Number(args.count);
const data = path.join(root, 'bench/out/extract-speed', `${args.seed}-${args.degrade}-${count}`);
const layouts = ['clinic-intake', 'marina-slip', 'garden-plot'] as const;
if (!existsSync(path.join(data, 'garden-plot'))) {
  for (const [i, layout] of layouts.entries()) {
    await generateSamples({
      layout,
      count,
      seed: Number(args.seed) + i,
      out: path.join(data, layout),
      fill: 'mixed',
      degrade: args.degrade as DegradeLevel,
      styles: 'train',
      format: 'png',
      upsideDownRate: 0,
    });
  }
}

const schemas = await loadSchemas(layouts.map((l) => path.join(root, 'schemas', `${l}.yaml`)));
const detector = await loadDetector(args.model as string, { intraOpThreads: Number(args.threads) });
const seconds: number[] = [];
const report = await runBatch({ ocr,
  inputs: layouts.map((l) => path.join(data, l)),
  schemas,
  detector,
  outDir: path.join(data, 'results'),
  onDocument: (e) => {
    if (e.line.ok && e.line.seconds !== undefined) seconds.push(e.line.seconds / (e.line.pages ?? 1));
  },
});
await detector.close();
await ocr.close();

const s = report.summary;
const mean = seconds.reduce((a, b) => a + b, 0) / Math.max(1, seconds.length);
console.log(`pages: ${s.pages} (${layouts.join(', ')}; ${args.degrade} degradation, seeds from ${args.seed})`);
console.log(`seconds/page: median ${percentile(seconds, 50).toFixed(2)}, p90 ${percentile(seconds, 90).toFixed(2)}, mean ${mean.toFixed(2)}`);
console.log(`fields: ${s.fields.total}, accepted ${(100 * (s.straightThroughRate ?? 0)).toFixed(1)} %`);
console.log(`peak RSS: ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB; onnxruntime intra-op threads ${args.threads}`);
