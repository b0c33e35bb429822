import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { PYTHON, missingPythonModules, skipUnlessPresent } from '../support/requirements.js';

// The digit reader's elastic distortion (training/digits/train.py elastic(), after Simard, Steinkraus and Platt,
// ICDAR 2003, section 2: a uniform random displacement field smoothed by a Gaussian, sigma 4 px, scaled by 34 px):
// it must bend strokes without moving or thinning the digit as a whole, leave undistorted glyphs untouched, and be
// reproducible from the seed. Skipped with the reason where torch is missing, as the training smoke test is.
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const missing = missingPythonModules(['torch', 'numpy', 'PIL']);

const SCRIPT = `
import json, sys, torch
sys.path.insert(0, 'training/digits')
from train import elastic
# A ring of ink 2 px wide, radius 7, centred in the 28 x 28 frame (an MNIST "0" has about this size).
ys, xs = torch.meshgrid(torch.arange(28.0), torch.arange(28.0), indexing='ij')
r = ((ys - 13.5) ** 2 + (xs - 13.5) ** 2).sqrt()
ring = ((r - 7).abs() < 1.0).float()[None, None].repeat(16, 1, 1, 1)
def centroid(g):
    m = g.sum((2, 3))
    return torch.stack([(g * xs).sum((2, 3)) / m, (g * ys).sum((2, 3)) / m], 2)
same = elastic(ring, torch.Generator().manual_seed(1), 0.0)
a = elastic(ring, torch.Generator().manual_seed(7), 1.0)
b = elastic(ring, torch.Generator().manual_seed(7), 1.0)
print(json.dumps({
  'untouched': bool(torch.equal(same, ring)),
  'reproducible': bool(torch.equal(a, b)),
  'changed': float((a - ring).abs().sum((1, 2, 3)).min() / ring[0].sum()),
  'mass': [float(x) for x in (a.sum((1, 2, 3)) / ring[0].sum())],
  'shift': float((centroid(a) - centroid(ring)).norm(dim=2).max()),
}))
`;

describe('elastic distortion of training digits', () => {
  it('bends strokes but keeps the digit in place and its ink, reproducibly', (ctx) => {
    skipUnlessPresent(ctx, missing);
    const run = spawnSync(PYTHON, ['-c', SCRIPT], { cwd: root, encoding: 'utf8', timeout: 120_000 });
    expect(run.status, run.stderr).toBe(0);
    const r = JSON.parse(run.stdout.trim().split('\n').pop()!) as { untouched: boolean; reproducible: boolean; changed: number; mass: number[]; shift: number };
    expect(r.untouched).toBe(true);
    expect(r.reproducible).toBe(true);
    // Every distorted ring differs from the original by at least a tenth of its ink...
    expect(r.changed).toBeGreaterThan(0.1);
    // ...while the ink is roughly kept (the field stretches and squeezes strokes, so the ink follows the local change
    // of area: within 0.6..1.6, no stroke vanishes or floods the frame) and the digit stays put: a smoothed field
    // moves neighbouring pixels together, so the centre moves a few pixels, far less than the 34 px scale (under 6 px
    // of the 28 px frame; 4 px is the most seen over these 16 rings).
    for (const m of r.mass) expect(m).toBeGreaterThan(0.6), expect(m).toBeLessThan(1.6);
    expect(r.shift).toBeLessThan(6);
  }, 150_000);
});
