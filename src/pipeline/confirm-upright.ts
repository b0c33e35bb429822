import type { Detection, Detector } from '../detect/types.js';
import { confirmHalfTurn } from '../page/half-turn.js';
import type { NormalizedPage } from '../page/normalize.js';
import type { LoadedSchema } from '../schema/load.js';
import type { ReferencePages } from './reference-pages.js';

/** A normalized page and what the detector found on it; replaced in place when the page is turned. */
export interface DetectedPage {
  normalized: NormalizedPage;
  detections: Detection[];
}

/**
 * Up versus down settled against the blank, for each page of a form whose schema page names one. The text cue of
 * orientation (page/orientation.ts) reads ascenders; on a form printed in capitals it has nothing to read and can
 * turn an upright page over (DD Form 293, upright, was turned 180° by the text cue alone; see
 * test/pipeline/confirm-upright.test.ts). Registration with the blank does not read text. A page that is turned is
 * detected again. `pages[p]` is the form's page p; those before `from` are taken as settled. Returns the indices
 * (within `pages`) that were turned. `knownScore` is the first page's registration score when the layout choice
 * already computed it against this schema's blank, so the page is not registered twice.
 */
export async function confirmUpright(
  pages: DetectedPage[],
  loaded: LoadedSchema,
  references: ReferencePages,
  detector: Detector,
  from = 0,
  knownScore?: number,
): Promise<number[]> {
  const turned: number[] = [];
  for (const [p, page] of pages.entries()) {
    if (p < from) continue;
    const reference = references.page(loaded, p);
    if (!reference) continue;
    const check = confirmHalfTurn(page.normalized, reference, { knownScore: p === 0 ? knownScore : undefined });
    if (!check.flipped) continue;
    page.normalized = check.page;
    page.detections = await detector.detect(check.page.image);
    turned.push(p);
  }
  return turned;
}
