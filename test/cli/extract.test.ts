import { copyFile, mkdir, mkdtemp, readFile, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { DocumentResult } from '../../src/result/document.js';
import { generateSamples } from '../../src/synth/generate.js';
import { REPO, runCli } from './run-cli.js';

const SCHEMA = path.join(REPO, 'schemas/clinic-intake.yaml');
let work: string;
let page: string;
let truth: { fields: { name: string; value: unknown }[] };

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-extract-'));
  // A held-out seed (>= 900000): never used for training the detector.
  await generateSamples({
    layout: 'clinic-intake',
    count: 1,
    seed: 900_321,
    out: path.join(work, 'gen'),
    fill: 'typed',
    degrade: 'light',
    styles: 'train',
    format: 'png',
    upsideDownRate: 0,
  });
  page = path.join(work, 'gen', 'clinic-intake-900321-00000.png');
  truth = JSON.parse(await readFile(path.join(work, 'gen', 'truth', 'clinic-intake-900321-00000.json'), 'utf8'));
});

describe('formglean extract (end to end, real detector and OCR)', () => {
  it('writes a checked JSON record for a scanned form, a results line, a summary and a review queue', async () => {
    const out = path.join(work, 'out-ok');
    const run = await runCli(['extract', page, '--schema', SCHEMA, '--out', out]);
    expect(run.stderr).not.toMatch(/Error|at .*\.ts/);
    expect(run.code).toBe(0);
    const result = DocumentResult.parse(JSON.parse(await readFile(path.join(out, 'clinic-intake-900321-00000.json'), 'utf8')));
    expect(result.fields.map((f) => f.name)).toEqual(truth.fields.map((f) => f.name));
    // Every field located (by detection or, failing that, its aligned region) and given a status.
    expect(result.fields.every((f) => f.box !== null)).toBe(true);
    const exact = result.fields.filter((f) => {
      const t = truth.fields.find((x) => x.name === f.name)!;
      return JSON.stringify(f.value) === JSON.stringify(t.value);
    });
    // Floor from measurement: this page reads 26 of 26 fields exactly with the shipped model; 80 % leaves room for
    // OCR-engine variation while still failing if a stage (alignment, cleanup, normalization) breaks.
    expect(exact.length / result.fields.length).toBeGreaterThanOrEqual(0.8);
    const lines = (await readFile(path.join(out, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ ok: true, document: 'clinic-intake-900321-00000' });
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.documents).toEqual({ total: 1, processed: 1, failed: 0 });
    expect(summary.fields.total).toBe(truth.fields.length);
    const queue = await readFile(path.join(out, 'review', 'queue.csv'), 'utf8');
    expect(queue.charCodeAt(0)).toBe(0xfeff); // UTF-8 BOM so spreadsheets pick the encoding
    // Logs never carry field values: no truth value appears in what the command printed.
    for (const f of truth.fields) {
      if (typeof f.value === 'string' && f.value.length > 3) expect(run.stderr + run.stdout).not.toContain(f.value);
    }
  });

  it('records bad files in a folder run and still processes the good one (exit 1)', async () => {
    const folder = path.join(work, 'mixed');
    const out = path.join(work, 'out-mixed');
    await mkdir(folder, { recursive: true });
    await copyFile(page, path.join(folder, 'good.png'));
    const png = await readFile(page);
    await writeFile(path.join(folder, 'corrupt.png'), png.subarray(0, Math.floor(png.length / 3)));
    await writeFile(path.join(folder, 'notes.jpg'), 'Owner called to move the appointment.\n');
    const run = await runCli(['extract', folder, '--schema', SCHEMA, '--out', out]);
    expect(run.code).toBe(1);
    const lines = (await readFile(path.join(out, 'results.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    const byDoc = new Map(lines.map((l) => [l.document, l]));
    expect(byDoc.get('good').ok).toBe(true);
    expect(byDoc.get('corrupt').error).toMatch(/corrupt\.png: page 1 cannot be decoded \(corrupt or truncated image/);
    expect(byDoc.get('notes').error).toMatch(/notes\.jpg: not a readable image/);
    // One line per problem on stderr, no stack traces.
    expect(run.stderr).not.toMatch(/\n\s+at /);
  });

  it('refuses a broken schema, a missing model and a text file posing as a model with one line and exit 2', async () => {
    const broken = path.join(work, 'broken.yaml');
    await writeFile(broken, (await readFile(SCHEMA, 'utf8')).replace('type: postal_code', 'type: postcode'));
    let run = await runCli(['extract', page, '--schema', broken, '--out', path.join(work, 'o1')]);
    expect(run.code).toBe(2);
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toMatch(/broken\.yaml: fields\[\d+\]\.type: unknown field type; known types: text, date/);

    run = await runCli(['extract', page, '--schema', SCHEMA, '--model', path.join(work, 'none.onnx'), '--out', path.join(work, 'o2')]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/none\.onnx/);

    run = await runCli(['extract', page, '--out', path.join(work, 'o4')]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/--schema <file> is required/);

    const notFolder = path.join(work, 'taken.txt');
    await writeFile(notFolder, 'x');
    run = await runCli(['extract', page, '--schema', SCHEMA, '--out', notFolder]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/taken\.txt: the --out path exists and is not a folder/);

    const fake = path.join(work, 'fake.onnx');
    await writeFile(fake, 'not a model');
    run = await runCli(['extract', page, '--schema', SCHEMA, '--model', fake, '--out', path.join(work, 'o3')]);
    expect(run.code).toBe(2);
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toMatch(/fake\.onnx: /);
  });
});
