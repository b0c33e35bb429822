/**
 * Detector speed per page on one core: letterbox + onnxruntime inference + decoding + NMS, with onnxruntime's
 * intra-op threads and libvips threads set to 1 (the target is per core), on generated pages. Prints median and p90
 * ms per page (and the letterbox share of it), model load time and the process's peak resident memory.
 *
 *   npx tsx bench/detector-speed.ts [--model models/form-elements.onnx] [--data DIR] [--layout random]
 *                                   [--count 30] [--seed 900100] [--degrade light] [--threads 1] [--warmup 3]
 *
 * Without --data it generates the pages once into bench/out/detector-speed/ (held-out seeds: >= 900000 only).
 * Page decoding is outside the timed part; each page is decoded just before it is detected so that only one page
 * is held at a time.
 */
import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import sharp from 'sharp';
import { letterbox } from '../src/detect/letterbox.js';
import { loadDetector } from '../src/detect/onnx-detector.js';
import { percentile } from '../src/eval/percentile.js';
import { decodeDocument } from '../src/input/decode.js';
import { DEFAULT_MODEL_PATH } from '../src/models.js';
import { generateSamples } from '../src/synth/generate.js';
import type { LayoutName } from '../src/synth/layouts.js';
import type { DegradeLevel } from '../src/synth/scan-params.js';

const { values: args } = parseArgs({
  options: {
    model: { type: 'string', default: DEFAULT_MODEL_PATH },
    data: { type: 'string' },
    layout: { type: 'string', default: 'random' },
    count: { type: 'string', default: '30' },
    seed: { type: 'string', default: '900100' },
    degrade: { type: 'string', default: 'light' },
    threads: { type: 'string', default: '1' },
    warmup: { type: 'string', default: '3' },
  },
});

// One core: libvips (sharp's resize inside letterbox) gets one thread too.
sharp.concurrency(1);

const seed = Number(args.seed);
if (!args.data && seed < 900000) throw new Error('--seed must be >= 900000 (held-out seeds)');

async function pagesFolder(): Promise<string> {
  if (args.data) return args.data;
  const dir = path.join('bench', 'out', 'detector-speed', `${args.layout}-s${seed}-n${args.count}-${args.degrade}`);
  if (!existsSync(path.join(dir, 'coco.json'))) {
    process.stderr.write(`generating ${args.count} pages into ${dir}\n`);
    await generateSamples({
      layout: args.layout as LayoutName,
      count: Number(args.count),
      seed,
      out: dir,
      fill: 'mixed',
      degrade: args.degrade as DegradeLevel,
      styles: 'all',
      format: 'png',
      upsideDownRate: 0,
    });
  }
  return dir;
}

const dir = await pagesFolder();
const files = readdirSync(dir)
  .filter((f) => /\.(png|jpe?g|tiff?)$/i.test(f))
  .sort()
  .map((f) => path.join(dir, f));
if (files.length === 0) throw new Error(`${dir}: no page images`);

const t0 = performance.now();
const detector = await loadDetector(args.model, { intraOpThreads: Number(args.threads) });
const loadMs = performance.now() - t0;

const first = (await decodeDocument(files[0])).pages[0];
for (let i = 0; i < Number(args.warmup); i++) await detector.detect(first);

const times: number[] = [];
const letterboxTimes: number[] = [];
const sizes: number[] = [];
let detections = 0;
for (const file of files) {
  const page = (await decodeDocument(file)).pages[0];
  sizes.push((page.width * page.height) / 1e6);
  const l0 = performance.now();
  await letterbox(page, detector.inputWidth, detector.inputHeight);
  letterboxTimes.push(performance.now() - l0);
  const start = performance.now();
  detections += (await detector.detect(page)).length;
  times.push(performance.now() - start);
}
await detector.close();

const rssMb = process.resourceUsage().maxRSS / 1024; // maxRSS is in kilobytes (Node.js docs)
const row = (k: string, v: string) => process.stdout.write(`${k.padEnd(32)}${v}\n`);
row('model', `${detector.id} (input ${detector.inputWidth}x${detector.inputHeight})`);
row('pages', `${times.length} from ${dir}`);
row('intra-op threads', String(args.threads));
row('model load', `${loadMs.toFixed(0)} ms`);
row('ms per page, median', percentile(times, 50).toFixed(1));
row('ms per page, p90', percentile(times, 90).toFixed(1));
row('ms per page, min..max', `${Math.min(...times).toFixed(1)}..${Math.max(...times).toFixed(1)}`);
row('  of which letterbox, median', `${percentile(letterboxTimes, 50).toFixed(1)} (p90 ${percentile(letterboxTimes, 90).toFixed(1)})`);
row('page size, median', `${percentile(sizes, 50).toFixed(1)} MP`);
row('detections per page, mean', (detections / times.length).toFixed(1));
row('peak RSS', `${rssMb.toFixed(0)} MB`);
