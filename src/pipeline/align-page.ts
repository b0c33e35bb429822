import type { Detection } from '../detect/types.js';
import { expectedParts } from '../locate/expected-boxes.js';
import { alignPage } from '../page/align.js';
import type { Alignment, LayoutRegion } from '../page/alignment.js';
import type { GrayImage } from '../image/raster.js';
import type { PageResult } from '../result/document.js';
import type { LoadedSchema } from '../schema/load.js';
import type { ReferencePages } from './reference-pages.js';

/** The schema's regions on one reference page, with the detector class that should find each. */
export function layoutRegions(loaded: LoadedSchema, pageIndex: number): LayoutRegion[] {
  const fields = loaded.fields.filter((f) => f.spec.page === pageIndex);
  return expectedParts(fields).flatMap((p) => (p.region ? [{ box: p.region, className: p.className }] : []));
}

/** Align an upright page to a schema page by detections and, where the schema has one, its blank image. */
export async function alignToSchemaPage(
  loaded: LoadedSchema,
  pageIndex: number,
  page: GrayImage,
  detections: readonly Detection[],
  references: ReferencePages,
): Promise<Alignment> {
  const referenceSize = loaded.schema.pages[pageIndex];
  const reference = references.page(loaded, pageIndex);
  return alignPage({ page, referenceSize, reference, detections, regions: layoutRegions(loaded, pageIndex) });
}

const round = (v: number, k = 100) => Math.round(v * k) / k;

export function alignmentRecord(a: Alignment): NonNullable<PageResult['alignment']> {
  const t = a.transform;
  return {
    method: a.method,
    transform: { a: round(t.a, 1e6), b: round(t.b, 1e6), c: round(t.c, 1e3), d: round(t.d, 1e6), e: round(t.e, 1e6), f: round(t.f, 1e3) },
    residual: a.residual === null ? null : round(a.residual),
    matched: a.inliers,
    score: round(a.score, 1000),
  };
}
