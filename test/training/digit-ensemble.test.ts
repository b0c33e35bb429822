import { spawnSync } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { DigitReader } from '../../src/read/digit-reader.js';
import type { GrayImage } from '../../src/image/raster.js';
import { PYTHON, missingPythonModules, skipUnlessPresent } from '../support/requirements.js';

// training/digits/ensemble.py: the shipped digit reader is the mean of two networks' probabilities in one ONNX
// graph. Two members exported by export.py from differently seeded (untrained) networks are averaged, with the
// weights stored as float16; onnxruntime (the runtime extract uses) must then give, cell for cell, the mean of the
// members' probabilities (float16 weights: within 1e-2) and the reader must accept the file's metadata.
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const missing = missingPythonModules(['torch', 'onnx', 'numpy']);
let dir: string | undefined;
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

const MEMBER = (seed: number, out: string) => `
import sys, torch
sys.path.insert(0, 'training/digits')
from model import DigitCellCNN
from cells import CLASS_NAMES
torch.manual_seed(${seed})
net = DigitCellCNN(len(CLASS_NAMES))
with torch.no_grad():
    for m in net.modules():
        if isinstance(m, torch.nn.BatchNorm2d):
            m.running_mean.uniform_(-0.1, 0.1); m.running_var.uniform_(0.5, 1.5)
    # A loud head, so that the two members' probabilities differ widely from cell to cell.
    net.head[-1].weight.mul_(40)
torch.save(net.state_dict(), ${JSON.stringify(out)})
`;

function run(args: string[]): void {
  const r = spawnSync(PYTHON, args, { cwd: root, encoding: 'utf8', timeout: 180_000 });
  expect(r.status, r.stderr).toBe(0);
}

/** A few cells of varied ink: stripes, a block, a ring, empty paper. */
function cells(): GrayImage[] {
  const out: GrayImage[] = [];
  for (let k = 0; k < 4; k++) {
    const w = 30, h = 40;
    const data = new Uint8Array(w * h).fill(235);
    for (let y = 0; y < h; y++)
      for (let x = 0; x < w; x++) {
        const ink = k === 0 ? x % 7 < 2 : k === 1 ? x > 8 && x < 20 && y > 10 && y < 30 : k === 2 ? Math.abs(Math.hypot(x - 15, y - 20) - 9) < 1.5 : false;
        if (ink) data[y * w + x] = 30;
      }
    out.push({ width: w, height: h, data });
  }
  return out;
}

describe('digit reader ensemble (training/digits/ensemble.py)', () => {
  it('averages its members: the ensemble reads the mean of their probabilities', async (ctx) => {
    skipUnlessPresent(ctx, missing);
    dir = await mkdtemp(path.join(os.tmpdir(), 'formglean-ensemble-'));
    const members: string[] = [];
    for (const seed of [1, 2]) {
      const pt = path.join(dir, `m${seed}.pt`);
      const onnx = path.join(dir, `m${seed}.onnx`);
      run(['-c', MEMBER(seed, pt)]);
      run(['training/digits/export.py', '--checkpoint', pt, '--out', onnx]);
      members.push(onnx);
    }
    const ens = path.join(dir, 'ensemble.onnx');
    run(['training/digits/ensemble.py', '--half-weights', '--out', ens, '--models', ...members]);
    const readers = await Promise.all([...members, ens].map((m) => DigitReader.open(m)));
    try {
      const input = cells();
      const probs = await Promise.all(readers.map(async (r) => (await r.readCells(input)).map((c) => c.digitProbability)));
      const [a, b, e] = probs;
      // Summed digit probability is linear in the class probabilities, so it averages like them.
      for (let i = 0; i < input.length; i++) expect(e[i]).toBeCloseTo((a[i] + b[i]) / 2, 2);
      // Untrained members disagree, so the check is not trivially a member's own output.
      expect(a.some((v, i) => Math.abs(v - b[i]) > 0.02)).toBe(true);
    } finally {
      await Promise.all(readers.map((r) => r.close()));
    }
  }, 300_000);
});
