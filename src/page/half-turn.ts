import { alignByImage } from './align-image.js';
import { composeAffine } from '../image/geometry.js';
import type { NormalizedPage } from './normalize.js';
import type { GrayImage } from '../image/raster.js';
import type { QuarterTurn } from '../image/warp.js';
import { rotateQuarter } from '../image/warp.js';

/**
 * Up versus down checked against the blank reference: a page registered the right way up correlates with its
 * blank (0.8..0.97 measured on bench/page-align.ts and bench/real-form-page.ts), upside down it does not (under
 * 0.2). Text cues fail on heavily blurred small type, where letters merge; this check does not read text, so it
 * backs the text cue up whenever the schema names a reference image.
 */

export interface HalfTurnCheck {
  /** The page, turned half round when that registers better. */
  page: NormalizedPage;
  flipped: boolean;
  /** Registration score as the page was, and turned half round (NaN when the page registered well as it was). */
  score: number;
  turnedScore: number;
}

export interface HalfTurnOptions {
  /** How much better the turned page must register to be turned (default 0.1). */
  margin?: number;
  /** Registration levels (coarse suffices; default [150, 300]). */
  levels?: number[];
  /**
   * A page that registers at least this well as it is stands the right way up, and the turned registration is not
   * computed (default 0.5: midway between the measured upright 0.8..0.97 and upside-down under 0.2). Saves one
   * registration on nearly every page.
   */
  uprightAbove?: number;
  /** The page's registration score against this reference when the caller has already computed it (layout choice
   *  registers the first page): then it is not registered again as it is. */
  knownScore?: number;
}

/** Turn a normalized page half round if it then registers clearly better with the reference. Pure. */
export function confirmHalfTurn(n: NormalizedPage, reference: GrayImage, options: HalfTurnOptions = {}): HalfTurnCheck {
  const levels = options.levels ?? [150, 300];
  const score = options.knownScore ?? alignByImage(n.image, reference, { levels }).score;
  if (score >= (options.uprightAbove ?? 0.5)) return { page: n, flipped: false, score, turnedScore: Number.NaN };
  const turned = rotateQuarter(n.image, 180);
  const turnedScore = alignByImage(turned.image, reference, { levels }).score;
  if (turnedScore <= score + (options.margin ?? 0.1)) return { page: n, flipped: false, score, turnedScore };
  const page: NormalizedPage = {
    ...n,
    image: turned.image,
    rotation: ((n.rotation + 180) % 360) as QuarterTurn,
    transform: composeAffine(turned.transform, n.transform),
  };
  return { page, flipped: true, score, turnedScore };
}
