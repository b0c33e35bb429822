import { copyFile, mkdir, mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STAGES } from '../../src/results/stage-times.js';
import { generateSamples } from '../../src/synth/generate.js';
import { records } from './records.js';
import { REPO, runCli } from '../cli/run-cli.js';

const SCHEMA = path.join(REPO, 'schemas/clinic-intake.yaml');
let work: string;
let inputs: string;
let values: string[];

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-workers-'));
  // Held-out seeds (>= 900000): never used for training the detector.
  const gen = path.join(work, 'gen');
  await generateSamples({ layout: 'clinic-intake', count: 4, seed: 900_611, out: gen, fill: 'typed', degrade: 'light', styles: 'train', format: 'png', upsideDownRate: 0 });
  inputs = path.join(work, 'in');
  const pages = (await readdir(gen)).filter((f) => f.endsWith('.png')).sort();
  await mkdir(inputs, { recursive: true });
  await copyFile(path.join(gen, pages[0]), path.join(inputs, 'single-a.png'));
  await copyFile(path.join(gen, pages[1]), path.join(inputs, 'single-b.png'));
  // Two one-page forms scanned into one file: a stack that becomes records stack.p1 and stack.p2.
  const stack = await Promise.all([pages[2], pages[3]].map((p) => readFile(path.join(gen, p))));
  await sharp(stack, { join: { animated: true } }).tiff().toFile(path.join(inputs, 'stack.tif'));
  values = [];
  for (const p of pages) {
    const truth = JSON.parse(await readFile(path.join(gen, 'truth', p.replace(/\.png$/, '.json')), 'utf8')) as { fields: { value: unknown }[] };
    for (const f of truth.fields) if (typeof f.value === 'string' && f.value.length > 3) values.push(f.value);
  }
}, 120_000);

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

describe('extract --workers (real detector and OCR in worker threads)', () => {
  it('writes the same records with 1 and 2 workers; one progress step per input; stage times in summary.json; --json-log carries no field values', async () => {
    const one = path.join(work, 'out-1');
    const two = path.join(work, 'out-2');
    const a = await runCli(['extract', inputs, '--schema', SCHEMA, '--out', one, '--workers', '1']);
    expect(a.code).toBe(0);
    const b = await runCli(['extract', inputs, '--schema', SCHEMA, '--out', two, '--workers', '2', '--json-log']);
    expect(b.stderr).not.toMatch(/Error|at .*\.ts/);
    expect(b.code).toBe(0);

    const r1 = await records(one);
    const r2 = await records(two);
    expect([...r1.keys()]).toEqual(['single-a.json', 'single-b.json', 'stack.p1.json', 'stack.p2.json']);
    expect([...r2.keys()]).toEqual([...r1.keys()]);
    for (const [name, r] of r1) expect(r2.get(name), name).toEqual(r);
    const index = async (dir: string) => (await readFile(path.join(dir, 'results.jsonl'), 'utf8')).replace(/"seconds":[0-9.]+/g, '');
    expect(await index(two)).toBe(await index(one));

    // Three inputs, three steps: the stack's two forms are one step, not [2/3] twice.
    const steps = a.stderr.split('\n').filter((l) => /^\[\d+\/\d+\]/.test(l));
    expect(steps.map((l) => l.match(/^\[(\d+)\/3\]/)?.[1])).toEqual(['1', '2', '3']);
    expect(steps.find((l) => l.includes('stack.tif'))).toMatch(/2 forms, \d+ accepted, \d+ to review in \d+\.\d s$/);

    for (const [dir, workers] of [[one, 1], [two, 2]] as const) {
      const summary = JSON.parse(await readFile(path.join(dir, 'summary.json'), 'utf8'));
      expect(summary.run).toMatchObject({ workers, pages: 4, interrupted: false, inputs: { total: 3, read: 3, kept: 0, notReached: 0 } });
      expect(Object.keys(summary.run.stages).sort()).toEqual([...STAGES, 'ocr'].sort());
      // Every stage the pipeline has took time on real pages; tesseract's time is a part of reading.
      for (const s of ['decode', 'normalize', 'detect', 'align', 'locate', 'read', 'write', 'ocr']) expect(summary.run.stages[s].ms, s).toBeGreaterThan(0);
      expect(summary.run.stages.ocr.ms).toBeLessThan(summary.run.stages.read.ms);
      expect(summary.run.pagesPerSecond).toBeGreaterThan(0);
    }

    // --json-log: one JSON object per line on stderr, an event per input, no field value anywhere.
    const events = b.stderr.trim().split('\n').map((l) => JSON.parse(l) as { event: string; file?: string; documents?: { id: string }[] });
    expect(events[0]).toMatchObject({ event: 'start', inputs: 3, workers: 2 });
    expect(events.filter((e) => e.event === 'input')).toHaveLength(3);
    expect(events.find((e) => e.file?.endsWith('stack.tif'))?.documents?.map((d) => d.id)).toEqual(['stack.p1', 'stack.p2']);
    expect(events.at(-1)).toMatchObject({ event: 'done', done: 3, total: 3, failed: 0, interrupted: false });
    for (const v of values) expect(b.stderr + b.stdout, 'a field value in the log').not.toContain(v);
  }, 600_000);

  it('keeps unchanged inputs with --resume and does not show the time of the run that read them', async () => {
    const one = path.join(work, 'out-1');
    const again = await runCli(['extract', inputs, '--schema', SCHEMA, '--out', one, '--resume', '--workers', '2']);
    expect(again.code).toBe(0);
    const steps = again.stderr.split('\n').filter((l) => /^\[\d+\/\d+\]/.test(l));
    expect(steps).toHaveLength(3);
    for (const l of steps) expect(l).toMatch(/\(unchanged, kept\)$/);
    const summary = JSON.parse(await readFile(path.join(one, 'summary.json'), 'utf8'));
    expect(summary.run).toMatchObject({ pages: 0, inputs: { total: 3, read: 0, kept: 3 } });
  }, 300_000);
});
