/**
 * Batch speed on one machine: `extract` (the built command line, run as a child process as a clerk would) over
 * generated typed pages of the clinic intake form (26 fields), with 1 and 2 workers. Prints pages/s, ms per stage
 * (summary.json's run section), the ratio of wall time to tesseract's own time, the ratio against full-page
 * tesseract.js OCR of the same pages (one worker, automatic page segmentation), and the process's peak RSS (worker
 * threads share one process: "per worker" is that peak divided by the workers, main thread included).
 *
 *   npm run build && npx tsx bench/batch-speed.ts [--pages 24] [--workers 1,2] [--rss-pages 100,2000] [--full-page 4]
 *     [--malloc-arena-max N]
 *
 * --malloc-arena-max runs `extract` with MALLOC_ARENA_MAX=N in its environment (glibc's cap on its per-thread memory
 * arenas; other C libraries ignore it); without it the bench's own environment is passed on as it is.
 * --rss-pages runs 2 workers over that many pages (the --pages pages copied under new names as needed) for the
 * memory figures. Writes bench/out/batch-speed/report.json.
 */
import { spawn } from 'node:child_process';
import { copyFile, mkdir, readdir, readFile, rm } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import { createWorker, OEM } from 'tesseract.js';
import { writeJsonAtomic } from '../src/io/atomic-write.js';
import { englishLangPath } from '../src/read/ocr-engine.js';
import type { RunRecord } from '../src/results/run-record.js';
import { generateSamples } from '../src/synth/generate.js';

const { values: args } = parseArgs({
  options: {
    pages: { type: 'string', default: '24' },
    seed: { type: 'string', default: '900900' },
    workers: { type: 'string', default: '1,2' },
    'rss-pages': { type: 'string', default: '' },
    'full-page': { type: 'string', default: '4' },
    'malloc-arena-max': { type: 'string' },
  },
});

const root = path.resolve(import.meta.dirname, '..');
const cli = path.join(root, 'dist/cli/main.js');
if (!existsSync(cli)) throw new Error('run `npm run build` first: the bench runs dist/cli/main.js');
const schema = path.join(root, 'schemas/clinic-intake.yaml');
const count = Number(args.pages);
const base = path.join(root, 'bench/out/batch-speed');
const pagesDir = path.join(base, `pages-${args.seed}-${count}`);

if (!existsSync(path.join(pagesDir, 'coco.json'))) {
  // Evaluation seeds (>= 900000): never used for training the detector.
  await generateSamples({ layout: 'clinic-intake', count, seed: Number(args.seed), out: pagesDir, fill: 'typed', degrade: 'light', styles: 'train', format: 'png', upsideDownRate: 0 });
}
const pages = (await readdir(pagesDir)).filter((f) => f.endsWith('.png')).sort().map((f) => path.join(pagesDir, f));

/** A folder of n pages: the generated ones, copied under new names as often as needed. */
async function folderOf(n: number): Promise<string> {
  if (n <= pages.length) return pagesDir;
  const dir = path.join(base, `copies-${args.seed}-${n}`);
  await mkdir(dir, { recursive: true });
  for (let i = 0; i < n; i++) {
    const to = path.join(dir, `copy-${String(i).padStart(5, '0')}.png`);
    if (!existsSync(to)) await copyFile(pages[i % pages.length], to);
  }
  return dir;
}

async function extract(dir: string, n: number, workers: number): Promise<RunRecord & { processSeconds: number }> {
  const out = path.join(base, `results-${n}-w${workers}`);
  await rm(out, { recursive: true, force: true });
  const started = performance.now();
  const code = await new Promise<number | null>((resolve) => {
    const child = spawn(process.execPath, [cli, 'extract', path.join(dir, '*.png'), '--schema', schema, '--out', out, '--workers', String(workers), '--quiet'], {
      stdio: ['ignore', 'ignore', 'inherit'],
      env: args['malloc-arena-max'] ? { ...process.env, MALLOC_ARENA_MAX: args['malloc-arena-max'] } : process.env,
    });
    child.on('close', resolve);
  });
  if (code !== 0) throw new Error(`extract with ${workers} worker(s) exited ${code}`);
  const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8')) as { run: RunRecord };
  return { ...summary.run, processSeconds: (performance.now() - started) / 1000 };
}

/** Full-page OCR of the same pages: tesseract.js, one worker, its default automatic page segmentation. */
async function fullPageOcr(n: number): Promise<{ seconds: number; cpuSeconds: number }> {
  const worker = await createWorker('eng', OEM.LSTM_ONLY, { langPath: englishLangPath(), cacheMethod: 'none', gzip: true });
  try {
    await worker.recognize(pages[0]); // warm-up, not timed
    const started = performance.now();
    // tesseract.js's worker is a thread of this process: the process's CPU time is the OCR's (this loop only waits).
    const cpu = process.cpuUsage();
    for (const p of pages.slice(0, n)) await worker.recognize(p);
    const used = process.cpuUsage(cpu);
    return { seconds: (performance.now() - started) / 1000 / n, cpuSeconds: (used.user + used.system) / 1e6 / n };
  } finally {
    await worker.terminate();
  }
}

/** The machine's 1-minute load average: on a shared machine, say how busy it was beside each figure. */
function loadAverage(): string {
  return os.loadavg()[0].toFixed(1);
}

const runs: Record<string, RunRecord & { processSeconds: number }> = {};
for (const w of args.workers.split(',').filter(Boolean).map(Number)) {
  runs[`w${w}`] = await extract(pagesDir, pages.length, w);
  const r = runs[`w${w}`];
  console.log(
    `${w} worker(s), ${r.pages} pages: ${r.pagesPerSecond} pages/s (run ${r.wallSeconds} s, process ${r.processSeconds.toFixed(1)} s), ` +
      `${(r.cpuSeconds / r.pages).toFixed(2)} CPU s/page, peak RSS ${r.peakRssMb} MB; load average ${loadAverage()}`,
  );
}
const rss: Record<string, RunRecord & { processSeconds: number }> = {};
for (const n of args['rss-pages'].split(',').filter(Boolean).map(Number)) {
  rss[`p${n}`] = await extract(await folderOf(n), n, 2);
  const r = rss[`p${n}`];
  console.log(`2 workers, ${n} pages: peak RSS ${r.peakRssMb} MB (${Math.round(r.peakRssMb / 2)} MB per worker), ${r.pagesPerSecond} pages/s`);
}
const fullPage = Number(args['full-page']) > 0 ? await fullPageOcr(Number(args['full-page'])) : null;

const one = runs.w1;
const two = runs.w2;
console.log('\nms per page by stage (1 worker | 2 workers; stages of concurrent documents overlap in time):');
for (const s of Object.keys(one?.stages ?? two?.stages ?? {})) {
  console.log(`  ${s.padEnd(10)} ${String(one?.stages[s as keyof RunRecord['stages']].msPerPage ?? '-').padStart(8)} | ${String(two?.stages[s as keyof RunRecord['stages']].msPerPage ?? '-').padStart(8)}`);
}
const ratio = one && one.stages.ocr.ms > 0 ? one.wallSeconds / (one.stages.ocr.ms / 1000) : null;
const speedup = one && two && one.pagesPerSecond && two.pagesPerSecond ? two.pagesPerSecond / one.pagesPerSecond : null;
const best = Math.max(one?.pagesPerSecond ?? 0, two?.pagesPerSecond ?? 0);
const vsFull = fullPage !== null && best > 0 ? fullPage.seconds * best : null;
// The same comparison in CPU seconds per page, which the neighbours' load on a shared machine changes much less.
const vsFullCpu = fullPage !== null && one ? fullPage.cpuSeconds / (one.cpuSeconds / one.pages) : null;
const flat = rss.p100 && rss.p2000 ? rss.p2000.peakRssMb / rss.p100.peakRssMb : null;
const perWorker = Math.max(...Object.values(rss).map((r) => r.peakRssMb / 2), two ? two.peakRssMb / 2 : 0);
const verdict = (ok: boolean | null) => (ok === null ? 'not measured' : ok ? 'met' : 'NOT met');
console.log(
  `\nfull-page tesseract.js OCR: ${fullPage?.seconds.toFixed(2) ?? '-'} s/page, ${fullPage?.cpuSeconds.toFixed(2) ?? '-'} CPU s/page ` +
    `(one worker, ${args['full-page']} pages; load average ${loadAverage()})`,
);
console.log(`targets (issue 21):`);
console.log(`  wall / OCR time, 1 worker: ${ratio?.toFixed(2) ?? '-'} (target <= 1.25): ${verdict(ratio === null ? null : ratio <= 1.25)}`);
console.log(`  2 workers / 1 worker: ${speedup?.toFixed(2) ?? '-'}x (target >= 1.8): ${verdict(speedup === null ? null : speedup >= 1.8)}`);
console.log(`  against full-page OCR: ${vsFull?.toFixed(2) ?? '-'}x faster by wall time, ${vsFullCpu?.toFixed(2) ?? '-'}x by CPU time of 1 worker (target >= 5): ${verdict(vsFull === null ? null : vsFull >= 5)}`);
console.log(`  peak RSS per worker: ${perWorker.toFixed(0)} MB (target <= 450): ${verdict(perWorker > 0 ? perWorker <= 450 : null)}`);
console.log(`  RSS 2000 / 100 pages: ${flat?.toFixed(2) ?? '-'} (target 0.9..1.1): ${verdict(flat === null ? null : flat >= 0.9 && flat <= 1.1)}`);
console.log(`  pages/s on this machine: ${best} (target >= 2): ${verdict(best > 0 ? best >= 2 : null)}`);
await writeJsonAtomic(path.join(base, 'report.json'), { mallocArenaMax: args['malloc-arena-max'] ?? process.env.MALLOC_ARENA_MAX ?? null, pages: pages.length, loadAverage: os.loadavg(), cores: os.availableParallelism(), runs, vsFullCpu, rss, fullPageSecondsPerPage: fullPage, ratio, speedup, vsFull, perWorker, flat });
