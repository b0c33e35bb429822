import type { ThresholdProposal } from './calibration-thresholds.js';
import { percentInText } from './figures.js';

/** Whether the proposed thresholds meet the target error on the labels, and whether the labels can show it. */
export interface TargetCheck {
  /** met: observed error at or under the target and its 95 % upper bound too; unproven: observed error meets it
   *  but too few accepted fields to show it; missed: observed error above the target, or nothing accepted. */
  verdict: 'met' | 'unproven' | 'missed';
  /** Wrong among accepted, on the calibration labels; null when nothing is accepted. */
  observed: number | null;
  /** One-sided 95 % upper confidence bound on the error among accepted; null when nothing is accepted. */
  upper: number | null;
  /** Accepted fields with no error that would show the target at 95 %: ln(0.05) / ln(1 - target). */
  needed: number | null;
  /** One plain sentence for the user. */
  message: string;
}

/** One-sided 95 % normal quantile (standard normal table). */
const Z95 = 1.6448536;

/**
 * Upper 95 % bound on an error rate of k errors in n: for k = 0 the exact binomial bound 1 - 0.05^(1/n) (about 3/n,
 * the "rule of three", Hanley & Lippman-Hand, JAMA 1983); otherwise the Wilson score bound (Wilson, JASA 1927).
 */
export function errorUpperBound(k: number, n: number): number {
  if (n <= 0) return 1;
  if (k === 0) return 1 - Math.pow(0.05, 1 / n);
  const p = k / n;
  const z2 = Z95 * Z95;
  const centre = p + z2 / (2 * n);
  const spread = Z95 * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return Math.min(1, (centre + spread) / (1 + z2 / n));
}


export function checkTarget(p: ThresholdProposal): TargetCheck {
  const target = p.targetError;
  const needed = target > 0 ? Math.ceil(Math.log(0.05) / Math.log(1 - target)) : null;
  if (p.accepted === 0) {
    return {
      verdict: 'missed',
      observed: null,
      upper: null,
      needed,
      message: `TARGET NOT MET: no threshold accepts any field at ${percentInText(target)} wrong among accepted; every field goes to review.`,
    };
  }
  const observed = p.acceptedErrors / p.accepted;
  const upper = errorUpperBound(p.acceptedErrors, p.accepted);
  if (observed > target + 1e-12) {
    return {
      verdict: 'missed',
      observed,
      upper,
      needed,
      message: `TARGET NOT MET: ${percentInText(observed)} wrong among the ${p.accepted} accepted labeled fields, over the target ${percentInText(target)}.`,
    };
  }
  if (upper > target) {
    return {
      verdict: 'unproven',
      observed,
      upper,
      needed,
      message:
        `TARGET NOT SHOWN: ${percentInText(observed)} wrong among ${p.accepted} accepted labeled fields, but with so few the error ` +
        `could be up to ${percentInText(upper)} (95 % bound); showing ${percentInText(target)} takes at least ${needed ?? '-'} accepted ` +
        `fields without an error.`,
    };
  }
  return { verdict: 'met', observed, upper, needed, message: `Target met: ${percentInText(observed)} wrong among ${p.accepted} accepted (95 % bound ${percentInText(upper)}).` };
}
