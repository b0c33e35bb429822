import type { Affine, Point } from '../../src/image/geometry.js';
import { applyAffine, composeAffine, invertAffine } from '../../src/image/geometry.js';
import { fitTransform } from '../../src/page/fit.js';
import { normalizePage } from '../../src/page/normalize.js';
import type { GrayImage } from '../../src/image/raster.js';
import type { DocumentResult } from '../../src/result/document.js';
import type { LoadedSchema } from '../../src/schema/load.js';
import { fieldRegions } from '../../src/schema/resolved-field.js';
import { applyH, type Homography } from '../../src/synth/homography.js';

/**
 * How far the tool's page alignment puts the schema's regions from where the simulated scan really moved them:
 * every corner of every region of page 0, carried (a) by the transform the result reports, composed with the page
 * normalization that extract applied before it, and (b) by the scan's true reference→page homography. Distances are
 * in source-page pixels.
 */
export interface AlignmentError {
  /** Largest corner distance over all regions. */
  max: number;
  /** Mean corner distance. */
  mean: number;
  corners: number;
  /**
   * The same figures for the least-squares affine fit to the true corners: the best any affine alignment can do.
   * A simulated scan adds a small keystone (a projective term), which no affine map follows across the page.
   */
  affineLimit: { max: number; mean: number };
}

/**
 * Reference → source-page transform of a result's first page. The result stores the page→reference alignment on the
 * normalized (upright, deskewed) page; normalization is a pure function of the decoded page, so running it again
 * gives the same normalized→source map extract used.
 */
export function referenceToSource(result: DocumentResult, source: GrayImage): Affine | null {
  const a = result.pages[0]?.alignment;
  if (!a) return null;
  const normalized = normalizePage(source, { deskew: true, orientation: true });
  const refToNormalized = invertAffine(a.transform);
  return composeAffine(invertAffine(normalized.transform), refToNormalized);
}

function corners(r: readonly [number, number, number, number]): Point[] {
  const [x, y, w, h] = r;
  return [[x, y], [x + w, y], [x, y + h], [x + w, y + h]];
}

function distances(t: Affine, from: readonly Point[], to: readonly Point[]): { max: number; mean: number } {
  const d = from.map((p, i) => {
    const [x, y] = applyAffine(t, p);
    return Math.hypot(x - to[i][0], y - to[i][1]);
  });
  return { max: Math.max(...d), mean: d.reduce((s, v) => s + v, 0) / d.length };
}

export function alignmentError(loaded: LoadedSchema, refToSource: Affine, truth: Homography): AlignmentError {
  const ref: Point[] = loaded.fields
    .filter((f) => f.spec.page === 0)
    .flatMap((f) => fieldRegions(f).flatMap(({ region }) => corners(region)));
  const onPage: Point[] = ref.map((p) => applyH(truth, p[0], p[1]));
  const best = fitTransform('affine', ref, onPage);
  if (!best) throw new Error('the schema regions do not determine an affine fit');
  return { ...distances(refToSource, ref, onPage), corners: ref.length, affineLimit: distances(best, ref, onPage) };
}
