import { copyFile, mkdir, mkdtemp, readFile, rm, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DocumentResult } from '../../src/result/document.js';
import { whiteTiffPages } from '../input/tiff-bomb.js';
import { REPO, runCli, type CliRun } from './run-cli.js';

/**
 * The bad-input corpus: one extract over a folder of broken, empty, hostile and unusable inputs beside good scans.
 * Each bad input must end as one line naming the file (exit 1 for the run), no field of an unusable page may be
 * accepted, and the good documents must come out whole. Configuration problems exit 2 with one line.
 */
const SCHEMA = path.join(REPO, 'schemas/clinic-intake.yaml');
const PAGE = path.join(REPO, 'samples/clinic-intake-typed.png');
// A file name carrying a forged progress line (U+2215 DIVISION SLASH looks like "/", which no file name may hold)
// and an ANSI "erase line" sequence (ECMA-48 EL, ESC [ 2 K).
const EVIL = 'evil\n[9\u22159] good.png: 26 accepted\u001b[2K.png';

let work: string;
let corpus: string;
let out: string;
let run: CliRun;
type Line = { ok: boolean; error?: string; skipped?: string; document: string; json?: string; requestedId?: string; path: string };
let all: Line[];
let lines: Record<string, Line>;

/** The bad inputs and the problem each must be refused for (matched against its one-line message). */
const BAD: Record<string, RegExp> = {
  'black.png': /page 1 is almost all black \(\d+ % dark pixels\): not a readable scan$/,
  'tiny.png': /page is 1x1 pixels: a side under 16 px cannot hold a form$/,
  'small.png': /page 1 is 300x400 pixels, too small to read a form \(the short side needs at least 500 px\)$/,
  'blank.png': /page 1 is blank \(no printed or written marks found\)$/,
  'strip.png': /page is 1x200000 pixels: a side under 16 px cannot hold a form$/,
  'bomb.tif': /pages add up to \d+ pixels, over the 420000000-pixel limit for one file$/,
  'corrupt.png': /page 1 cannot be decoded \(corrupt or truncated image/,
  'notes.jpg': /not a readable image \(expected png, jpeg, tiff, webp or pdf\)$/,
  'empty.png': /empty file$/,
  'garbage.pdf': /not a readable PDF \(corrupt, truncated or encrypted\)$/,
  'cut.tif': /cannot be decoded|not a readable image/,
  [EVIL]: /not a readable image/,
};

afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

beforeAll(async () => {
  work = await mkdtemp(path.join(os.tmpdir(), 'fg-corpus-'));
  corpus = path.join(work, 'corpus');
  out = path.join(corpus, 'out'); // output inside the input folder: must never be read back
  await mkdir(corpus);
  await copyFile(PAGE, path.join(corpus, 'good.png'));
  // A stack of two forms (ids stack.p1, stack.p2) beside a scan named stack.p2.png: the ids must not collide.
  await copyFile(path.join(REPO, 'samples/clinic-intake-batch.tif'), path.join(corpus, 'stack.tif'));
  await sharp(PAGE).png({ compressionLevel: 3 }).toFile(path.join(corpus, 'stack.p2.png'));
  // The good page with transparent paper: ink opaque, paper alpha 0 (alpha = 255 - gray, colour black).
  const { data, info } = await sharp(PAGE).grayscale().raw().toBuffer({ resolveWithObject: true });
  const rgba = Buffer.alloc(info.width * info.height * 4);
  for (let i = 0; i < info.width * info.height; i++) rgba[i * 4 + 3] = 255 - data[i];
  await sharp(rgba, { raw: { width: info.width, height: info.height, channels: 4 } }).png().toFile(path.join(corpus, 'transparent.png'));
  // A page of prose that passes the ink checks but is no form of this layout.
  const prose = Array.from({ length: 40 }, (_, i) => `<text x="60" y="${80 + i * 38}" font-size="26">Slip ${i + 1}: the marina office keeps the winter log in the blue binder.</text>`).join('');
  await sharp(Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="1275" height="1650"><rect width="1275" height="1650" fill="white"/>${prose}</svg>`))
    .png()
    .toFile(path.join(corpus, 'not-a-form.png'));

  await sharp({ create: { width: 1275, height: 1650, channels: 3, background: 'black' } }).png().toFile(path.join(corpus, 'black.png'));
  await sharp({ create: { width: 1, height: 1, channels: 3, background: 'white' } }).png().toFile(path.join(corpus, 'tiny.png'));
  await sharp({ create: { width: 300, height: 400, channels: 3, background: 'white' } }).png().toFile(path.join(corpus, 'small.png'));
  await sharp({ create: { width: 1275, height: 1650, channels: 3, background: 'white' } }).png().toFile(path.join(corpus, 'blank.png'));
  await sharp({ create: { width: 1, height: 200_000, channels: 3, background: 'white' } }).png().toFile(path.join(corpus, 'strip.png'));
  await writeFile(path.join(corpus, 'bomb.tif'), whiteTiffPages(50, 7740, 7740));
  const png = await readFile(PAGE);
  await writeFile(path.join(corpus, 'corrupt.png'), png.subarray(0, Math.floor(png.length / 3)));
  await writeFile(path.join(corpus, 'notes.jpg'), 'Owner called to move the appointment.\n');
  await writeFile(path.join(corpus, 'empty.png'), '');
  await writeFile(path.join(corpus, 'garbage.pdf'), '%PDF-1.4\nnot really a pdf\n');
  const tif = await readFile(path.join(REPO, 'samples/clinic-intake-batch.tif'));
  await writeFile(path.join(corpus, 'cut.tif'), tif.subarray(0, 600));
  await writeFile(path.join(corpus, EVIL), 'not an image');
  // Inputs a folder search must skip, each listed with its reason.
  await writeFile(path.join(corpus, '.scan-in-progress.png'), png);
  await writeFile(path.join(corpus, 'readme.txt'), 'Scans of the spring intake.\n');
  await copyFile(PAGE, path.join(corpus, 'good.overlay.png'));
  await mkdir(path.join(corpus, 'old-results', 'review', 'crops'), { recursive: true });
  await writeFile(path.join(corpus, 'old-results', 'results.jsonl'), '');
  await copyFile(PAGE, path.join(corpus, 'old-results', 'review', 'crops', 'r0123.png'));
  await symlink(corpus, path.join(corpus, 'loop'));
  await symlink(path.join(corpus, 'good.png'), path.join(corpus, 'good-again.png'));

  run = await runCli(['extract', corpus, '--schema', SCHEMA, '--out', out]);
  const text = await readFile(path.join(out, 'results.jsonl'), 'utf8');
  all = text.trim().split('\n').map((l) => JSON.parse(l) as Line);
  lines = Object.fromEntries(all.map((l) => [path.relative(corpus, l.path), l]));
}, 400_000);

async function record(name: string): Promise<DocumentResult> {
  return DocumentResult.parse(JSON.parse(await readFile(path.join(out, name), 'utf8')));
}

describe('the bad-input corpus', () => {
  it('refuses each bad input with one line naming the file, and exits 1', async () => {
    expect(run.code).toBe(1);
    for (const [name, problem] of Object.entries(BAD)) {
      const l = lines[name];
      expect(l, name).toBeDefined();
      expect(l.ok, name).toBe(false);
      // One line: the file's path (control characters escaped), then the problem.
      expect(l.error, name).not.toMatch(/[\n\r\u001b]/);
      expect(l.error!.startsWith(`${path.join(corpus, name).replace('\n', '\\n').replace('\u001b', '\\x1b')}: `), name).toBe(true);
      expect(l.error, name).toMatch(problem);
    }
    // Nothing printed raw: no stack trace, no forged line, no escape sequence reaches the terminal.
    expect(run.stderr).not.toMatch(/\n\s+at /);
    expect(run.stderr).not.toContain('\u001b');
    expect(run.stderr.split('\n').filter((l) => l.startsWith('[9\u22159] good.png'))).toEqual([]);
    expect(run.stderr).toContain('evil\\n[9\u22159] good.png: 26 accepted\\x1b[2K.png');
  });

  it('accepts no field of an unusable page, and reads transparent paper like the opaque page', async () => {
    const good = await record('good.json');
    expect(good.counts.accepted).toBeGreaterThan(15);
    const notForm = await record('not-a-form.json');
    expect(notForm.counts.accepted).toBe(0);
    expect(notForm.fields.every((f) => f.reasons.includes('page_not_aligned'))).toBe(true);
    const transparent = await record('transparent.json');
    expect(transparent.fields.map((f) => [f.value, f.status])).toEqual(good.fields.map((f) => [f.value, f.status]));
  });

  it('gives every form its own id and record: a stack beside a scan named like its second form', async () => {
    expect(lines['stack.p2.png'].document).toBe('stack.p2');
    const stack = all.filter((l) => l.path.endsWith('stack.tif')).map((l) => [l.document, l.requestedId]);
    expect(stack).toEqual([['stack.p1', undefined], ['stack.p2-2', 'stack.p2']]);
    // Paths are recorded relative to the working folder the command ran in (the repository here).
    expect((await record('stack.p2.json')).document.path).toBe(path.relative(REPO, path.join(corpus, 'stack.p2.png')));
    expect((await record('stack.p2-2.json')).document.path).toBe(path.relative(REPO, path.join(corpus, 'stack.tif')));
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.documents).toEqual({ total: 6 + Object.keys(BAD).length, processed: 6, failed: Object.keys(BAD).length });
  });

  it('lists every skipped input with its reason, and never reads its own output back', async () => {
    const skipped = Object.fromEntries(Object.entries(lines).filter(([, l]) => l.skipped).map(([n, l]) => [n, l.skipped]));
    expect(skipped).toEqual({
      '.scan-in-progress.png': 'hidden file',
      'readme.txt': 'not a png, jpg, jpeg, tif, tiff, webp, pdf file (by its extension)',
      'good.overlay.png': "formglean's own output (a field overlay)",
      'old-results': 'a formglean results folder (output, not input)',
      loop: 'folder already searched (a link back to it: a loop, or a second link)',
      // Paths are recorded relative to the working folder the command ran in (the repository here).
      'good-again.png': `same file as ${path.relative(REPO, path.join(corpus, 'good.png'))} (a second link to it)`,
    });
    const summary = JSON.parse(await readFile(path.join(out, 'summary.json'), 'utf8'));
    expect(summary.skipped).toHaveLength(6);
    // A second run over the same folder does not take its own results folder (corpus/out) as input.
    const again = await runCli(['extract', corpus, '--schema', SCHEMA, '--out', out, '--resume']);
    expect(again.code).toBe(1);
    const text = await readFile(path.join(out, 'results.jsonl'), 'utf8');
    expect(text).toContain(`"path":${JSON.stringify(path.relative(REPO, out))},"ok":false,"skipped":"this run's results folder (output, not input)"`);
    expect(text).not.toContain(path.join(out, 'review'));
  }, 300_000);
});

describe('configuration problems: exit 2, one line naming the file', () => {
  it('a YAML alias bomb in a schema', async () => {
    const file = path.join(work, 'laughs.yaml');
    const levels = ['a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]'];
    for (let i = 1; i < 9; i++) levels.push(`${String.fromCharCode(97 + i)}: &${String.fromCharCode(97 + i)} [${Array(9).fill(`*${String.fromCharCode(96 + i)}`).join(',')}]`);
    await writeFile(file, levels.join('\n') + '\n');
    const r = await runCli(['extract', PAGE, '--schema', file, '--out', path.join(work, 'out-laughs')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(new RegExp(`^formglean: ${file.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: not valid YAML/JSON: [^\\n]+\\n$`));
  });

  it('a results folder that cannot be created', async () => {
    const blocker = path.join(work, 'a-file');
    await writeFile(blocker, 'not a folder');
    const target = path.join(blocker, 'out');
    const r = await runCli(['extract', PAGE, '--schema', SCHEMA, '--out', target]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`formglean: ${target}: cannot write the results folder (ENOTDIR)\n`);
  });
});
