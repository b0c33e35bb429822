import type { Detection } from '../detect/types.js';
import type { Alignment } from '../page/alignment.js';
import { LAYOUT_MIN_SCORE, matchLayout } from '../page/layout-match.js';
import type { GrayImage } from '../image/raster.js';
import type { LoadedSchema } from '../schema/load.js';
import { alignToSchemaPage, layoutRegions } from './align-page.js';
import type { ReferencePages } from './reference-pages.js';

export interface LayoutChoice {
  schema: LoadedSchema;
  /** Full alignment of the form's first page to the chosen schema's first page. */
  alignment: Alignment;
  status: 'assigned' | 'unknown_layout';
  /** Fit score of the chosen layout (0..1). */
  score: number;
  candidates: { schema: string; score: number }[];
}

/**
 * Which schema is this page? With one schema, that one, unless the page registers to its blank worse than
 * LAYOUT_MIN_SCORE (unknown_layout). With several, each layout's first page is scored against the
 * page by a coarse registration (src/page/layout-match.ts, which also holds the measured threshold); the best is
 * aligned in full. When none fits, the best is still used so that a person sees what was read, and every field goes
 * to review with reason unknown_layout.
 */
export async function chooseLayout(
  schemas: readonly LoadedSchema[],
  page: GrayImage,
  detections: readonly Detection[],
  references: ReferencePages,
  /** A person said the page is the form of the one schema given (review/layout-question.ts): it is assigned whatever its fit. */
  named = false,
): Promise<LayoutChoice> {
  if (schemas.length === 0) throw new Error('chooseLayout needs at least one schema');
  if (schemas.length === 1) {
    const alignment = await alignToSchemaPage(schemas[0], 0, page, detections, references);
    const score = Math.round(alignment.score * 1000) / 1000;
    // A page registered to the blank worse than any page of its own layout is another form, one schema or several
    // (a garden-plot page read with the marina schema had fields "accepted"). The threshold is an image
    // correlation's: a fit by detections alone is judged by the page gate.
    const byImage = alignment.method === 'image' || alignment.method === 'image+detections';
    const status = !named && byImage && alignment.score < LAYOUT_MIN_SCORE ? 'unknown_layout' : 'assigned';
    return { schema: schemas[0], alignment, status, score, candidates: [{ schema: schemas[0].schema.form.name, score }] };
  }
  const candidates = schemas.map((s) => ({
    name: s.schema.form.name,
    referenceSize: s.schema.pages[0],
    reference: references.page(s, 0),
    regions: layoutRegions(s, 0),
  }));
  // The threshold is matchLayout's own default, measured in bench/page-align.ts.
  const match = matchLayout(page, candidates, { detections });
  const bestName = match.best ?? [...match.scores].sort((a, b) => b.score - a.score)[0].name;
  const schema = schemas.find((s) => s.schema.form.name === bestName) as LoadedSchema;
  const alignment = await alignToSchemaPage(schema, 0, page, detections, references);
  return {
    schema,
    alignment,
    status: match.best ? 'assigned' : 'unknown_layout',
    score: Math.round(match.score * 1000) / 1000,
    candidates: match.scores.map((s) => ({ schema: s.name, score: Math.round(s.score * 1000) / 1000 })),
  };
}
