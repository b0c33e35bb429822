/**
 * Detector pages from the real fillable forms (src/synth/real-layouts.ts), by half of the fixed split
 * (bench/real-forms-split.json):
 *
 *   npx tsx training/real-layouts.ts --half dev --seed 20001 --out training/data/real-dev        # training
 *   npx tsx training/real-layouts.ts --half held-out --seed 900101 --out training/data/eval-real-heldout   # evaluation
 *
 * The development half is for training (seeds 1..99999, DEVELOPERS.md "Labeled sets and seeds"); the held-out half
 * only for evaluation (seeds >= 900000): the script refuses any other pairing, so the held-out forms never reach
 * training. Options: --forms DIR (default ../shared/reference/real-forms/pdfs relative to the repo root), --per-page N
 * pages drawn per PDF page with widgets (default 6: blank, typed, handwriting in turn), --max-pages N widget pages per
 * form (default 3), --degrade light|heavy|mixed (default mixed), --upside-down R (default 0.02).
 */
import { readFile, rm } from 'node:fs/promises';
import { existsSync, renameSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { writeRealLayoutPages } from '../src/synth/real-layouts.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const { values: a } = parseArgs({
  options: {
    half: { type: 'string' },
    seed: { type: 'string' },
    out: { type: 'string' },
    forms: { type: 'string', default: path.join(ROOT, '..', 'shared', 'reference', 'real-forms', 'pdfs') },
    'per-page': { type: 'string', default: '6' },
    'max-pages': { type: 'string', default: '3' },
    degrade: { type: 'string', default: 'mixed' },
    'upside-down': { type: 'string', default: '0.02' },
  },
});
const fail = (msg: string): never => {
  process.stderr.write(`real-layouts: ${msg}\n`);
  process.exit(2);
};
if (!a.out) fail('--out DIR is required');
const seed = Number(a.seed);
if (!Number.isInteger(seed) || seed < 1) fail(`--seed: a whole number >= 1; got "${a.seed}"`);
if (a.half === 'dev' && seed >= 100000) fail(`--half dev is training data: seed must be 1..99999, got ${seed}`);
if (a.half === 'held-out' && seed < 900000) fail(`--half held-out is evaluation data only: seed must be >= 900000, got ${seed}`);
if (a.half !== 'dev' && a.half !== 'held-out') fail(`--half: dev or held-out; got "${a.half}"`);
const perPage = Number(a['per-page']);
const maxPages = Number(a['max-pages']);
if (!(Number.isInteger(perPage) && perPage >= 1)) fail(`--per-page: a whole number >= 1; got "${a['per-page']}"`);
if (!(Number.isInteger(maxPages) && maxPages >= 1)) fail(`--max-pages: a whole number >= 1; got "${a['max-pages']}"`);
if (!['light', 'heavy', 'mixed'].includes(a.degrade!)) fail(`--degrade: light, heavy or mixed; got "${a.degrade}"`);
const split = JSON.parse(await readFile(path.join(ROOT, 'bench', 'real-forms-split.json'), 'utf8')) as { development: string[]; heldOut: string[] };
const names = a.half === 'dev' ? split.development : split.heldOut;
const forms = names.map((f) => path.join(a.forms!, f)).filter((f) => existsSync(f));
if (forms.length === 0) fail(`${a.forms}: holds none of the ${a.half} forms`);
if (existsSync(path.join(a.out!, 'coco.json'))) {
  process.stdout.write(`keep ${a.out}\n`);
  process.exit(0);
}
const partial = `${a.out}.partial`;
await rm(partial, { recursive: true, force: true });
const s = await writeRealLayoutPages(
  { forms, out: partial, seed, perPage, maxPages, degrade: a.degrade as 'light' | 'heavy' | 'mixed', upsideDownRate: Number(a['upside-down']) },
  (line) => process.stdout.write(`${line}\n`),
);
renameSync(partial, a.out!);
process.stdout.write(
  `wrote ${s.pages} pages, ${s.annotations} boxes to ${a.out} in ${s.seconds.toFixed(0)} s; labels snapped ${s.snapped}, kept as drawn ${s.kept}; ` +
    `per class ${JSON.stringify(s.perClass)}\n`,
);
