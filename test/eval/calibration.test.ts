import { describe, expect, it } from 'vitest';
import { applyIsotonic, fitIsotonic, overallAccuracy, poolAdjacentViolators, smoothIsotonic } from '../../src/eval/calibration.js';
import { evaluateOnHoldout } from '../../src/eval/calibration-holdout.js';
import { evaluateThresholds, proposeThresholds, type CalibrationSample } from '../../src/eval/calibration-thresholds.js';

describe('pool-adjacent-violators', () => {
  it('solves the textbook exercise (23, 27, 25, 28)', () => {
    // Source: Robert and Casella (2005), Monte Carlo Statistical Methods, 2nd ed., the pool-adjacent-violators
    // exercise in chapter 1 (data and answer 23, 26, 26, 28 as worked at mc.hohoweiya.xyz/misc; the exercise
    // number from memory). By hand: 27 > 25 violates, pool to (27 + 25) / 2 = 26; 23 <= 26 <= 28 holds.
    expect(poolAdjacentViolators([23, 27, 25, 28])).toEqual([23, 26, 26, 28]);
  });

  it('pools weighted blocks repeatedly (hand computation)', () => {
    // Data of the same book's follow-up exercise, y = (18, 17, 12, 21, 16), weights (1, 1, 3, 3, 1), here under
    // the simple order. By hand: 18 > 17 -> (18 + 17) / 2 = 17.5 (w 2); 17.5 > 12 -> (35 + 36) / 5 = 14.2 (w 5);
    // 14.2 <= 21 holds; 21 > 16 -> (63 + 16) / 4 = 19.75 (w 4); 14.2 <= 19.75 holds.
    const fit = poolAdjacentViolators([18, 17, 12, 21, 16], [1, 1, 3, 3, 1]);
    [14.2, 14.2, 14.2, 19.75, 19.75].forEach((v, i) => expect(fit[i]).toBeCloseTo(v, 12));
  });

  it('turns right/wrong outcomes sorted by confidence into observed accuracy (hand computation)', () => {
    // y = 0 1 0 0 1 0 1 1 by increasing confidence. By hand: 1 > 0 pools to 0.5; 0.5 > 0 pools the three to 1/3;
    // 1 then 0 pools to 0.5 (>= 1/3 holds); 1, 1 hold. Fit: 0, 1/3 x3, 1/2 x2, 1, 1.
    const fit = poolAdjacentViolators([0, 1, 0, 0, 1, 0, 1, 1]);
    [0, 1 / 3, 1 / 3, 1 / 3, 0.5, 0.5, 1, 1].forEach((v, i) => expect(fit[i]).toBeCloseTo(v, 12));
  });

  it('pools tied inputs and evaluates between levels at the lower level', () => {
    // x = 0.5 appears twice with outcomes 1 and 0: tied inputs must map to one value, their mean 0.5 (de Leeuw
    // 1977's secondary approach, from memory). With 0.2 -> 0 and 0.9 -> 1 the fit is 0, 0.5, 1.
    const map = fitIsotonic([
      { x: 0.9, y: 1 },
      { x: 0.5, y: 1 },
      { x: 0.2, y: 0 },
      { x: 0.5, y: 0 },
    ]);
    expect(map.steps.map((s) => [s.from, s.to, s.value, s.weight])).toEqual([
      [0.2, 0.2, 0, 1],
      [0.5, 0.5, 0.5, 2],
      [0.9, 0.9, 1, 1],
    ]);
    expect(applyIsotonic(map, 0.7)).toBe(0.5); // between 0.5 and 0.9: the lower level
    expect(applyIsotonic(map, 0.05)).toBe(0);
    expect(applyIsotonic(map, 1)).toBe(1);
  });
});

function samples(field: string, rows: [number, boolean][], decidable = true): CalibrationSample[] {
  return rows.map(([confidence, correct]) => ({ field, type: 'text', confidence, correct, decidable }));
}

// Field A, by hand: outcomes by confidence 0 0 1 0 1 1 1 1 1 1 fit to levels
// [0.2, 0.4] -> 0 (2 samples), [0.5, 0.6] -> 0.5 (2), [0.7, 1.0] -> 1 (6).
const fieldA = samples('a', [
  [0.2, false],
  [0.4, false],
  [0.5, true],
  [0.6, false],
  [0.7, true],
  [0.8, true],
  [0.9, true],
  [0.95, true],
  [0.98, true],
  [1, true],
]);
// Field B, by hand: outcomes 1 1 1 0 1 fit to [0.3, 0.95] -> 3/4 (4 samples), [0.99] -> 1 (1).
const fieldB = samples('b', [
  [0.3, true],
  [0.5, true],
  [0.9, true],
  [0.95, false],
  [0.99, true],
]);

describe('review thresholds for a target error', () => {
  it('accepts whole levels while the error among accepted stays under the target (one field, by hand)', () => {
    // Target 10 %: level 1 (6 samples, 0 errors) is in; adding level 0.5 gives 1 error in 8 = 12.5 % > 10 %.
    let p = proposeThresholds(fieldA, { targetError: 0.1, minSamples: 1 });
    expect(p.fields[0]).toMatchObject({ field: 'a', threshold: 0.7, accepted: 6, acceptedErrors: 0, scope: 'field' });
    // Target 12.5 %: 1 in 8 is exactly on target, so the threshold drops to that level's lowest confidence.
    p = proposeThresholds(fieldA, { targetError: 0.125, minSamples: 1 });
    expect(p.fields[0]).toMatchObject({ threshold: 0.5, accepted: 8, acceptedErrors: 1 });
    expect(p.fields[0].acceptedShare).toBeCloseTo(0.8, 12);
  });

  it('shares the error budget across fields, taking the most reliable levels first (by hand)', () => {
    // Levels by calibrated accuracy: b[0.99] p=1 n=1, a[0.7..] p=1 n=6, b[0.3..0.95] p=3/4 n=4, a[0.5..0.6] p=1/2
    // n=2, a[0.2..0.4] p=0 n=2. Target 12.5 %: after the two p=1 levels (7, 0 errors), b's 3/4 level adds
    // 4 x 1/4 = 1 expected error: 1 / 11 = 9.1 % <= 12.5 %; a's 1/2 level would make 2 / 13 = 15.4 % > 12.5 %.
    let p = proposeThresholds([...fieldA, ...fieldB], { targetError: 0.125, minSamples: 1 });
    const by = Object.fromEntries(p.fields.map((f) => [f.field, f]));
    expect(by.a.threshold).toBe(0.7);
    expect(by.b.threshold).toBe(0.3);
    expect([p.accepted, p.acceptedErrors]).toEqual([11, 1]);
    // Target 5 %: b's 3/4 level (1 / 11 = 9.1 %) no longer fits, so b keeps only its top level.
    p = proposeThresholds([...fieldA, ...fieldB], { targetError: 0.05, minSamples: 1 });
    const by5 = Object.fromEntries(p.fields.map((f) => [f.field, f]));
    expect([by5.a.threshold, by5.b.threshold]).toEqual([0.7, 0.99]);
    expect([p.accepted, p.acceptedErrors]).toEqual([7, 0]);
  });

  it('pools sparse fields into their type and never counts invalid values as accepted', () => {
    const invalid = samples('a', [[0.99, false]], false);
    const p = proposeThresholds([...fieldA, ...fieldB, ...invalid], { targetError: 0.1, minSamples: 12 });
    expect(p.fields.map((f) => f.scope)).toEqual(['type', 'type']); // 11 and 5 samples < 12, the type has 16
    const a = p.fields.find((f) => f.field === 'a')!;
    expect(a.samples).toBe(11);
    // The invalid sample sits above the threshold but a threshold does not decide its fate.
    expect(a.accepted).toBe(fieldA.filter((s) => s.confidence >= a.threshold).length);
  });

  it('proposes 1 for a field no level of which meets the target', () => {
    const p = proposeThresholds(samples('c', [[0.5, false], [0.9, false]]), { targetError: 0.005, minSamples: 1 });
    expect(p.fields[0]).toMatchObject({ threshold: 1, accepted: 0 });
  });
});

describe('thresholds on held-out samples', () => {
  it('counts what the thresholds accept and how many of those are wrong (by hand)', () => {
    // Thresholds a 0.7, b 0.3. Field A: 0.7 .. 1 accepted (6, all right). Field B: all 5 reach 0.3, one wrong
    // (0.95). A non-decidable sample at 0.99 stays out. Accepted 11 of 16, 1 wrong.
    const held = [...fieldA, ...fieldB, ...samples('a', [[0.99, false]], false)];
    const o = evaluateThresholds(held, (f) => (f === 'a' ? 0.7 : 0.3));
    expect(o).toEqual({ samples: 16, accepted: 11, acceptedErrors: 1, acceptedShare: 11 / 16, errorAmongAccepted: 1 / 11 });
  });
});

describe('fit on one half, measure on the other', () => {
  it('applies the fitted thresholds and maps to held-out samples (hand computation)', () => {
    const held = samples('a', [
      [0.65, false],
      [0.75, true],
      [0.85, false],
      [0.9, true],
    ]);
    const h = evaluateOnHoldout(fieldA, held, { targetError: 0.1, minSamples: 1, bins: 15, fallbackThreshold: () => 0.8 });
    // Fitted threshold for a: 0.7 (see above) accepts 0.75, 0.85, 0.9: 3 accepted, 1 wrong. The schema's 0.8
    // accepts 0.85 and 0.9: 2 accepted, 1 wrong.
    expect(h.after).toMatchObject({ accepted: 3, acceptedErrors: 1 });
    expect(h.before).toMatchObject({ accepted: 2, acceptedErrors: 1 });
    // ECE, M = 15 (Guo et al. 2017), by hand. Stated: 0.65 -> bin 10 (gap 0.65), 0.75 -> bin 12 (0.25),
    // 0.85 -> bin 13 (0.85), 0.9 -> bin 14 (0.1); each weight 1/4: (0.65 + 0.25 + 0.85 + 0.1) / 4 = 0.4625.
    expect(h.eceRaw).toBeCloseTo(0.4625, 12);
    // Through a's map: 0.65 lies between levels and takes the lower one, 0.5 (bin 8, gap 0.5, weight 1/4);
    // the other three map to 1 (bin 15: accuracy 2/3, gap 1/3, weight 3/4). ECE = 0.125 + 0.25 = 0.375.
    expect(h.eceCalibrated).toBeCloseTo(0.375, 12);
  });
});

describe('smoothIsotonic (a Beta prior on each level)', () => {
  it("gives Laplace's rule of succession with prior 1/2 and strength 2", () => {
    // Laplace's rule of succession: after k successes in n trials, (k + 1) / (n + 2) (Laplace 1814, Essai
    // philosophique sur les probabilites; the formula as textbooks state it, from memory): 10 of 10 -> 11/12.
    const map = fitIsotonic(Array.from({ length: 10 }, (_, i) => ({ x: 0.9 + i / 100, y: 1 })));
    const s = smoothIsotonic(map, 0.5, 2);
    expect(s.steps).toHaveLength(1);
    expect(applyIsotonic(s, 0.95)).toBeCloseTo(11 / 12, 12);
  });

  it('keeps no level at 1 and restores the order a small top level loses', () => {
    // Levels by hand: 2 of 4 right at 0.1, 299 of 300 at 0.5, 3 of 3 at 0.9; PAV keeps the three apart.
    const pts = [
      ...[1, 1, 0, 0].map((y) => ({ x: 0.1, y })),
      ...Array.from({ length: 300 }, (_, i) => ({ x: 0.5, y: i === 0 ? 0 : 1 })),
      ...[1, 1, 1].map((y) => ({ x: 0.9, y })),
    ];
    const map = fitIsotonic(pts);
    expect(map.steps.map((s) => s.value)).toEqual([0.5, 299 / 300, 1]);
    const prior = overallAccuracy(map);
    expect(prior).toBeCloseTo(304 / 307, 12);
    const s = smoothIsotonic(map, prior, 4);
    // Shrunk: (299 + 4p) / 304 and (3 + 4p) / 7; the second falls under the first, so PAV pools them with weights
    // 304 and 7: (299 + 3 + 8p) / 311.
    expect(s.steps).toHaveLength(2);
    expect(s.steps[0].value).toBeCloseTo((2 + 4 * prior) / 8, 12);
    expect(s.steps[1].value).toBeCloseTo((302 + 8 * prior) / 311, 12);
    expect(s.steps[1].value).toBeLessThan(1);
    expect(s.steps[1]).toMatchObject({ from: 0.5, to: 0.9, weight: 303 });
    expect(smoothIsotonic(map, prior, 0)).toBe(map);
  });
});
