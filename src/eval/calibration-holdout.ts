import { applyIsotonic } from './calibration.js';
import {
  evaluateThresholds,
  proposeThresholds,
  type CalibrationSample,
  type ThresholdOutcome,
  type ThresholdProposal,
} from './calibration-thresholds.js';
import { reliability } from './reliability.js';

export interface HoldoutOptions {
  targetError: number;
  minSamples: number;
  bins: number;
  /** Threshold for a held-out field the fit half never saw (the schema's own). */
  fallbackThreshold: (field: string) => number;
}

export interface HoldoutEvaluation {
  proposal: ThresholdProposal;
  /** The schema's thresholds as they were, on the held-out half. */
  before: ThresholdOutcome;
  /** The proposed thresholds on the held-out half. */
  after: ThresholdOutcome;
  /** ECE of the held-out half: stated confidences, and after the fit half's confidence-to-accuracy maps. */
  eceRaw: number | null;
  eceCalibrated: number | null;
}

/**
 * Fit thresholds on one half of a labeled set and measure them on the other (honest figures: on the fit half
 * itself the isotonic maps reproduce the observed accuracy by construction).
 */
export function evaluateOnHoldout(
  fit: readonly CalibrationSample[],
  held: readonly CalibrationSample[],
  options: HoldoutOptions,
): HoldoutEvaluation {
  const proposal = proposeThresholds(fit, { targetError: options.targetError, minSamples: options.minSamples });
  const byField = new Map(proposal.fields.map((f) => [f.field, f]));
  const after = evaluateThresholds(held, (f) => byField.get(f)?.threshold ?? options.fallbackThreshold(f));
  const before = evaluateThresholds(held, options.fallbackThreshold);
  const calibrated = held.flatMap((s) => {
    const f = byField.get(s.field);
    return f ? [{ confidence: applyIsotonic(f.map, s.confidence), correct: s.correct }] : [];
  });
  return {
    proposal,
    before,
    after,
    eceRaw: reliability(held, options.bins).ece,
    eceCalibrated: reliability(calibrated, options.bins).ece,
  };
}
