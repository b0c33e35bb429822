import type { Detection } from '../detect/types.js';
import type { Affine } from '../page/geometry.js';
import { expectedParts } from '../locate/expected-boxes.js';
import { fitScaleTranslation } from '../locate/fit-scale-translation.js';
import type { FieldSpec } from '../schema/definition.js';
import type { PageResult } from '../result/document.js';

export interface PageAlignment {
  /** Reference layout → normalized page. */
  refToPage: Affine;
  record: NonNullable<PageResult['alignment']>;
}

/**
 * Fit the reference layout to the page: start from the ratio of page sizes (a scan of the same paper at another DPI),
 * then fit scale and translation to the detections matched by class and region.
 */
export function alignPage(
  fields: readonly FieldSpec[],
  detections: readonly Detection[],
  reference: { width: number; height: number },
  page: { width: number; height: number },
): PageAlignment {
  const initial: Affine = { a: page.width / reference.width, b: 0, c: 0, d: 0, e: page.height / reference.height, f: 0 };
  const fit = fitScaleTranslation(expectedParts(fields), detections, initial);
  const method = fit.residual === null ? 'page_size' : 'scale_translation';
  return {
    refToPage: fit.transform,
    record: { method, transform: fit.transform, residual: fit.residual === null ? null : Math.round(fit.residual * 100) / 100, matched: fit.matched },
  };
}
