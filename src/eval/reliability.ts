/**
 * Reliability bins and expected calibration error as defined by Guo, Pleiss, Sun and Weinberger (2017),
 * "On Calibration of Modern Neural Networks", ICML, section 2: predictions are grouped into M interval bins of
 * equal width, bin B_m holding the samples whose confidence falls in I_m = ((m-1)/M, m/M];
 * acc(B_m) = (1/|B_m|) sum 1(correct), conf(B_m) = (1/|B_m|) sum confidence, and
 * ECE = sum_m |B_m|/n * |acc(B_m) - conf(B_m)|.
 */

/** One scored prediction: the confidence the tool stated and whether its value was right. */
export interface ConfidenceOutcome {
  confidence: number;
  correct: boolean;
}

export interface ReliabilityBin {
  /** Bin interval (lower, upper]; the first bin also takes confidence exactly 0. */
  lower: number;
  upper: number;
  count: number;
  /** Mean correctness in the bin, null when the bin is empty. */
  accuracy: number | null;
  /** Mean confidence in the bin, null when the bin is empty. */
  confidence: number | null;
}

export interface Reliability {
  bins: ReliabilityBin[];
  /** Expected calibration error; null when there are no samples. */
  ece: number | null;
  /** Maximum calibration error over non-empty bins (same paper, same section); null when there are no samples. */
  mce: number | null;
  count: number;
}

/** Guo et al. (2017) report ECE with M = 15 bins (from memory of their tables); also our default. */
export const DEFAULT_BINS = 15;

/**
 * Index (0-based) of the bin ((m-1)/M, m/M] holding a confidence. The small tolerance keeps values that are
 * a bin edge in decimal (0.7 with M = 10, stored as 0.69999...) or just over it after float arithmetic
 * (0.7 * 10 = 7.000000000000001) in the bin whose upper edge they are.
 */
export function binIndex(confidence: number, bins: number): number {
  const m = Math.ceil(confidence * bins - 1e-9);
  return Math.min(bins, Math.max(1, m)) - 1;
}

export function reliability(samples: readonly ConfidenceOutcome[], bins = DEFAULT_BINS): Reliability {
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`bins must be a positive integer, got ${bins}`);
  const count = new Array<number>(bins).fill(0);
  const correct = new Array<number>(bins).fill(0);
  const confSum = new Array<number>(bins).fill(0);
  for (const s of samples) {
    if (!(s.confidence >= 0 && s.confidence <= 1)) {
      throw new RangeError(`confidence must lie in [0, 1], got ${s.confidence}`);
    }
    const i = binIndex(s.confidence, bins);
    count[i]++;
    confSum[i] += s.confidence;
    if (s.correct) correct[i]++;
  }
  const n = samples.length;
  let ece = 0;
  let mce = 0;
  const out: ReliabilityBin[] = [];
  for (let i = 0; i < bins; i++) {
    const c = count[i];
    const accuracy = c > 0 ? correct[i] / c : null;
    const confidence = c > 0 ? confSum[i] / c : null;
    if (accuracy !== null && confidence !== null) {
      const gap = Math.abs(accuracy - confidence);
      ece += (c / n) * gap;
      mce = Math.max(mce, gap);
    }
    out.push({ lower: i / bins, upper: (i + 1) / bins, count: c, accuracy, confidence });
  }
  return { bins: out, ece: n > 0 ? ece : null, mce: n > 0 ? mce : null, count: n };
}
