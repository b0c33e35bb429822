/**
 * Isotonic regression by the pool-adjacent-violators algorithm (PAV; Ayer et al. 1955, Barlow, Bartholomew,
 * Bremner and Brunk 1972, ch. 1): the nondecreasing fit that minimizes the weighted squared error to the data.
 * Used here to map a stated confidence to the accuracy observed at that confidence (Zadrozny and Elkan 2002
 * proposed it for calibrating classifier scores). References cited from memory.
 */

export interface WeightedValue {
  value: number;
  weight: number;
}

/**
 * PAV over values already in order: returns the fitted value of each input position.
 * Walks left to right keeping a stack of pooled blocks; whenever the newest block's mean falls below the one
 * before it (a violation), the two pool into their weighted mean, repeatedly, so each point is pushed and popped
 * at most once (linear time).
 */
export function poolAdjacentViolators(values: readonly number[], weights?: readonly number[]): number[] {
  if (weights && weights.length !== values.length) throw new RangeError('values and weights differ in length');
  const mean: number[] = [];
  const weight: number[] = [];
  const size: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const w = weights ? weights[i] : 1;
    if (!(w > 0)) throw new RangeError(`weights must be positive, got ${w} at ${i}`);
    mean.push(values[i]);
    weight.push(w);
    size.push(1);
    while (mean.length > 1 && mean[mean.length - 2] > mean[mean.length - 1]) {
      const w2 = weight.pop()!;
      const m2 = mean.pop()!;
      const s2 = size.pop()!;
      const k = mean.length - 1;
      const w1 = weight[k];
      mean[k] = (mean[k] * w1 + m2 * w2) / (w1 + w2);
      weight[k] = w1 + w2;
      size[k] += s2;
    }
  }
  const out: number[] = [];
  for (let b = 0; b < mean.length; b++) for (let j = 0; j < size[b]; j++) out.push(mean[b]);
  return out;
}

/** One level of the fitted step function: inputs in [from, to] (observed range) map to `value`. */
export interface IsotonicStep {
  from: number;
  to: number;
  value: number;
  /** Total weight (number of samples) pooled into this level. */
  weight: number;
}

export interface IsotonicMap {
  steps: IsotonicStep[];
}

/**
 * Fit a nondecreasing map from x to y. Equal x values are pooled first (their mean, weighted by count), so the
 * result is a function of x (the "secondary" treatment of ties in de Leeuw 1977).
 */
export function fitIsotonic(points: readonly { x: number; y: number; weight?: number }[]): IsotonicMap {
  const sorted = [...points].sort((a, b) => a.x - b.x);
  const xs: number[] = [];
  const ys: number[] = [];
  const ws: number[] = [];
  for (const p of sorted) {
    const w = p.weight ?? 1;
    const k = xs.length - 1;
    if (k >= 0 && xs[k] === p.x) {
      ys[k] = (ys[k] * ws[k] + p.y * w) / (ws[k] + w);
      ws[k] += w;
    } else {
      xs.push(p.x);
      ys.push(p.y);
      ws.push(w);
    }
  }
  const fitted = poolAdjacentViolators(ys, ws);
  const steps: IsotonicStep[] = [];
  for (let i = 0; i < xs.length; i++) {
    const last = steps[steps.length - 1];
    if (last && last.value === fitted[i]) {
      last.to = xs[i];
      last.weight += ws[i];
    } else {
      steps.push({ from: xs[i], to: xs[i], value: fitted[i], weight: ws[i] });
    }
  }
  return { steps };
}

/**
 * Evaluate the fitted map. Between two levels the lower one applies and outside the observed range the nearest
 * level applies: for a confidence the data never showed we claim no more accuracy than the data below it
 * supports (the cautious side for review thresholds).
 */
export function applyIsotonic(map: IsotonicMap, x: number): number {
  return map.steps[stepIndex(map, x)].value;
}

/** Index of the level that applies at x (see applyIsotonic). */
export function stepIndex(map: IsotonicMap, x: number): number {
  const { steps } = map;
  if (steps.length === 0) throw new RangeError('empty isotonic map');
  if (x < steps[0].from) return 0;
  // last step whose `from` is <= x
  let lo = 0;
  let hi = steps.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (steps[mid].from <= x) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * A fitted map with each level's accuracy shrunk toward `prior` by a Beta prior worth `strength` samples: a level of
 * n samples k right states (k + strength·prior) / (n + strength), the posterior mean under Beta(strength·prior,
 * strength·(1 − prior)) (Laplace's rule of succession is prior 1/2, strength 2; the Bayesian treatment of a binomial
 * rate, common practice). So no level claims accuracy 1 from a few hundred error-free fields, and a level of three
 * fields says little more than the prior. Shrinking can break the order of levels (a small top level falls further
 * than a large one below it), so the shrunk levels are pooled again by PAV, each weighted by n + strength.
 * Strength 0 returns the map as it is.
 */
export function smoothIsotonic(map: IsotonicMap, prior: number, strength: number): IsotonicMap {
  if (!(strength >= 0)) throw new RangeError(`prior strength must be >= 0, got ${strength}`);
  if (!(prior >= 0 && prior <= 1)) throw new RangeError(`prior must lie in [0, 1], got ${prior}`);
  if (strength === 0 || map.steps.length === 0) return map;
  const shrunk = map.steps.map((s) => (s.value * s.weight + strength * prior) / (s.weight + strength));
  const pooled = poolAdjacentViolators(shrunk, map.steps.map((s) => s.weight + strength));
  const steps: IsotonicStep[] = [];
  for (const [i, s] of map.steps.entries()) {
    const last = steps[steps.length - 1];
    if (last && last.value === pooled[i]) {
      last.to = s.to;
      last.weight += s.weight;
    } else {
      steps.push({ ...s, value: pooled[i] });
    }
  }
  return { steps };
}

/** Weighted mean of a map's levels: the accuracy over all the samples it was fitted on. */
export function overallAccuracy(map: IsotonicMap): number {
  const n = map.steps.reduce((a, s) => a + s.weight, 0);
  return n > 0 ? map.steps.reduce((a, s) => a + s.value * s.weight, 0) / n : 0;
}
