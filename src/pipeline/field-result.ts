import { scoreField, type AlignmentEvidence } from '../fields/scoring.js';
import { chooseCalibration } from '../fields/default-confidence.js';
import { valueFromDigitCells } from './digit-cross-check.js';
import type { Alignment } from '../page/alignment.js';
import type { Affine } from '../image/geometry.js';
import { transformBox, unionBox } from '../image/geometry.js';
import type { LocatedField } from '../locate/locate-fields.js';
import type { FieldResult } from '../result/document.js';
import type { FieldReadOutcome } from './read-field.js';


const round1 = (v: number) => Math.round(v * 10) / 10;

/** How a field's parts were located, taken together: every part detected, some from regions, or none found. */
function overallSource(located: LocatedField): { source: FieldResult['source']; detectionScore: number | null } {
  const parts = located.parts;
  if (parts.length === 0 || parts.every((p) => p.source === 'none')) return { source: 'none', detectionScore: null };
  if (parts.every((p) => p.source === 'detection')) {
    const scores = parts.map((p) => p.detectionScore ?? 0);
    return { source: 'detection', detectionScore: Math.min(...scores) };
  }
  return { source: 'region', detectionScore: null };
}

/**
 * A field that fails its type's checks keeps what was read: the type's own value where it has one, else the OCR text
 * on one line. The status (`invalid`) says it is unchecked; a reviewer then sees the reading next to the reason
 * instead of an empty cell, and a correction starts from it.
 */
function keptValue(interp: FieldReadOutcome['interpretation'], raw: string | null): FieldResult['value'] {
  if (!interp) return null;
  if (interp.value !== null || interp.outcome !== 'invalid' || raw === null) return interp.value;
  const text = raw.replace(/\s+/g, ' ').trim();
  return text === '' ? null : text;
}

/** The page's alignment as scoring sees it at one field: the weakest touch-up among its region parts. */
function alignmentEvidence(located: LocatedField, alignment: Alignment | undefined): AlignmentEvidence | undefined {
  if (!alignment) return undefined;
  // -1 is refineRegion's "not run" (the region's context reached past the blank's edge): no evidence either way.
  const refines = located.parts.flatMap((p) => (p.source === 'region' && p.refineScore !== undefined && p.refineScore > -1 ? [p.refineScore] : []));
  return {
    method: alignment.method,
    score: alignment.score,
    residual: alignment.residual,
    refine: refines.length ? Math.min(...refines) : null,
  };
}

/** Score a read field and shape it as the result contract says, with its box in source pixels. */
export function buildFieldResult(
  located: LocatedField,
  outcome: FieldReadOutcome,
  schemaThreshold: number | undefined,
  toSource: Affine,
  legibility = 1,
  alignment?: Alignment,
): FieldResult {
  const { field } = located;
  const { source, detectionScore } = overallSource(located);
  // The entry's script picks the shipped map (a blank area or a mark has none: group "none").
  const reader = valueFromDigitCells(outcome.details) ? 'digit_cells' : undefined;
  const calibration = chooseCalibration({ ...field, reader }, outcome.script?.script ?? 'none', schemaThreshold);
  const score = scoreField({
    detectionScore,
    source,
    reading: outcome.reading,
    interpretation: outcome.interpretation,
    reviewThreshold: calibration.threshold,
    required: field.required,
    confidenceMap: calibration.map,
    factorWeights: calibration.factorWeights,
    legibility,
    alignment: alignmentEvidence(located, alignment),
  });
  const locateReasons = located.parts.flatMap((p) => p.reasons);
  const reasons = [...new Set([...score.reasons, ...locateReasons])];

  const found = located.parts.flatMap((p) => (p.box ? [p.box] : []));
  const pageBox = found.length > 0 ? unionBox(found) : null;
  const srcBox = pageBox ? transformBox(toSource, pageBox) : null;
  const interp = outcome.interpretation;
  const raw = outcome.reading?.kind === 'text' ? outcome.reading.text : null;
  return {
    name: field.name,
    type: field.type,
    page: field.page,
    value: keptValue(interp, raw),
    raw,
    ...(interp?.extra ? { extra: interp.extra } : {}),
    status: score.status,
    confidence: score.confidence,
    reasons,
    box: srcBox ? { page: field.page, x: round1(srcBox.x), y: round1(srcBox.y), w: round1(srcBox.w), h: round1(srcBox.h) } : null,
    source,
    ...(outcome.script ? { script: outcome.script.script, scriptEvidence: outcome.script.handwriting } : {}),
    calibration: calibration.from,
    scores: score.scores,
    ...(Object.keys(outcome.details).length ? { details: outcome.details } : {}),
  };
}
