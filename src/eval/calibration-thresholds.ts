import { fitIsotonic, overallAccuracy, smoothIsotonic, stepIndex, type IsotonicMap } from './calibration.js';
import { groupBy } from './score-groups.js';

/** One field reading seen in calibration data. */
export interface CalibrationSample {
  field: string;
  type: string;
  confidence: number;
  correct: boolean;
  /** True when a review threshold decides this field's fate (status accepted or review); invalid and
   *  missing values go to review whatever their confidence, so they never count as accepted. */
  decidable: boolean;
}

export type FitScope = 'field' | 'type' | 'all';

export interface FieldCalibration {
  field: string;
  type: string;
  /** Which samples the confidence-to-accuracy map was fitted on. */
  scope: FitScope;
  map: IsotonicMap;
  samples: number;
  errors: number;
  /** Proposed review threshold: fields with confidence below it go to review. */
  threshold: number;
  /** Share of this field's samples the threshold accepts (of all samples, decidable or not). */
  acceptedShare: number;
  /** Observed errors among the samples the threshold accepts. */
  acceptedErrors: number;
  accepted: number;
}

export interface ThresholdProposal {
  targetError: number;
  fields: FieldCalibration[];
  /** Over all fields: accepted share and the error among accepted, on the calibration data. */
  accepted: number;
  acceptedErrors: number;
  samples: number;
}

export interface ProposalOptions {
  targetError: number;
  /** Fewest samples for a field (then a type) to get a map of its own; fewer pool upward. */
  minSamples: number;
  /** Each level shrunk toward the map's own overall accuracy by a Beta prior worth this many samples
   *  (smoothIsotonic); default 0, the observed accuracies as they are. */
  priorStrength?: number;
}

function fitSmoothed(samples: readonly CalibrationSample[], priorStrength: number): IsotonicMap {
  const map = fitIsotonic(samples.map((s) => ({ x: s.confidence, y: s.correct ? 1 : 0 })));
  return smoothIsotonic(map, overallAccuracy(map), priorStrength);
}

/**
 * Fit the confidence-to-accuracy maps: one per field when it has enough samples, else one per field type,
 * else one over everything (confidences of different types come from different evidence, so a type's own map
 * is preferred over the pooled one).
 */
export function fitMaps(
  samples: readonly CalibrationSample[],
  minSamples: number,
  priorStrength = 0,
): Map<string, { scope: FitScope; map: IsotonicMap; type: string }> {
  const fit = (of: readonly CalibrationSample[]) => fitSmoothed(of, priorStrength);
  const byField = groupBy(samples, (s) => s.field);
  const byType = groupBy(samples, (s) => s.type);
  const all = samples.length > 0 ? fit(samples) : null;
  const typeMaps = new Map<string, IsotonicMap>();
  const out = new Map<string, { scope: FitScope; map: IsotonicMap; type: string }>();
  for (const [field, own] of byField) {
    const type = own[0].type;
    if (own.length >= minSamples) {
      out.set(field, { scope: 'field', map: fit(own), type });
      continue;
    }
    const ofType = byType.get(type)!;
    if (ofType.length >= minSamples) {
      if (!typeMaps.has(type)) typeMaps.set(type, fit(ofType));
      out.set(field, { scope: 'type', map: typeMaps.get(type)!, type });
      continue;
    }
    out.set(field, { scope: 'all', map: all!, type });
  }
  return out;
}

/**
 * Per-field review thresholds that accept as many fields as possible while the expected error among all
 * accepted fields stays at or under the target.
 *
 * The fitted map is flat on each level (block) of the isotonic fit, so a field's samples fall into atoms: the
 * samples on one level of its map, all with the calibrated accuracy p of that level. Accepting atoms in order of
 * decreasing p makes the running mean of (1 - p) nondecreasing, so the largest acceptable set under a mean-error
 * bound is a prefix of that order (exchange argument: swapping an accepted atom for a rejected one of higher p
 * lowers the error). Within a field, higher levels have higher p, and ties in p go to the level with the higher
 * confidence, so a field's accepted atoms are its top levels: a threshold, set at the lower end of the lowest
 * accepted level (Atom.from). With a map of the field's own and no prior (priorStrength 0), expected errors equal observed errors on the
 * calibration data (each level's value is its observed accuracy).
 */
export function proposeThresholds(samples: readonly CalibrationSample[], options: ProposalOptions): ThresholdProposal {
  const { targetError, minSamples } = options;
  if (!(targetError >= 0 && targetError < 1)) throw new RangeError(`target error must lie in [0, 1), got ${targetError}`);
  const maps = fitMaps(samples, minSamples, options.priorStrength ?? 0);

  interface Atom {
    field: string;
    /** Where the threshold goes if the atom is the last accepted: the lower end of its level in the map, i.e. the
     *  lowest confidence of any sample the map was fitted on at that level. With a pooled map that is lower than
     *  the field's own lowest sample, which with a handful of samples per field would send an unseen but equally
     *  good reading to review. */
    from: number;
    p: number;
    count: number;
  }
  const atoms = new Map<string, Atom>();
  for (const s of samples) {
    if (!s.decidable) continue;
    const map = maps.get(s.field)!.map;
    const level = stepIndex(map, s.confidence);
    const key = `${s.field}\u0000${level}`;
    const a = atoms.get(key);
    if (a) a.count++;
    else atoms.set(key, { field: s.field, from: map.steps[level].from, p: map.steps[level].value, count: 1 });
  }
  const order = [...atoms.values()].sort(
    (a, b) => b.p - a.p || b.from - a.from || (a.field < b.field ? -1 : a.field > b.field ? 1 : 0),
  );
  let expectedErrors = 0;
  let count = 0;
  const lowestAccepted = new Map<string, number>();
  for (const a of order) {
    const e = expectedErrors + a.count * (1 - a.p);
    const n = count + a.count;
    // Small slack for float sums: an exactly-on-target set stays acceptable.
    if (e > targetError * n + 1e-12) break;
    expectedErrors = e;
    count = n;
    lowestAccepted.set(a.field, a.from);
  }

  const fields: FieldCalibration[] = [];
  let accepted = 0;
  let acceptedErrors = 0;
  for (const [field, own] of groupBy(samples, (s) => s.field)) {
    const fitted = maps.get(field)!;
    // No accepted sample: 1 sends everything below full confidence to review, the most a threshold can do.
    const threshold = lowestAccepted.get(field) ?? 1;
    const acc = own.filter((s) => s.decidable && s.confidence >= threshold);
    const accErrors = acc.filter((s) => !s.correct).length;
    accepted += acc.length;
    acceptedErrors += accErrors;
    fields.push({
      field,
      type: fitted.type,
      scope: fitted.scope,
      map: fitted.map,
      samples: own.length,
      errors: own.filter((s) => !s.correct).length,
      threshold,
      acceptedShare: acc.length / own.length,
      acceptedErrors: accErrors,
      accepted: acc.length,
    });
  }
  fields.sort((a, b) => (a.field < b.field ? -1 : a.field > b.field ? 1 : 0));
  return { targetError, fields, accepted, acceptedErrors, samples: samples.length };
}

export interface ThresholdOutcome {
  samples: number;
  accepted: number;
  acceptedErrors: number;
  /** Share of all samples accepted without review. */
  acceptedShare: number | null;
  errorAmongAccepted: number | null;
}

/**
 * What a set of review thresholds does to other labeled samples (a held-out set): a sample is accepted when a
 * threshold decides it and its confidence reaches its field's threshold.
 */
export function evaluateThresholds(
  samples: readonly CalibrationSample[],
  thresholdOf: (field: string) => number,
): ThresholdOutcome {
  const accepted = samples.filter((s) => s.decidable && s.confidence >= thresholdOf(s.field));
  const acceptedErrors = accepted.filter((s) => !s.correct).length;
  return {
    samples: samples.length,
    accepted: accepted.length,
    acceptedErrors,
    acceptedShare: samples.length > 0 ? accepted.length / samples.length : null,
    errorAmongAccepted: accepted.length > 0 ? acceptedErrors / accepted.length : null,
  };
}
