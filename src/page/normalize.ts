import { estimateSkew } from './deskew.js';
import type { Affine } from '../image/geometry.js';
import { composeAffine } from '../image/geometry.js';
import { glyphBoxes } from './glyphs.js';
import type { OrientationEstimate } from './orientation.js';
import { linesRunDown, orientationEstimate, textBandEvidence } from './orientation.js';
import type { GrayImage } from '../image/raster.js';
import type { QuarterTurn } from '../image/warp.js';
import { quarterTurnAffine, rotateGray, rotateQuarter } from '../image/warp.js';

/**
 * Upright and level: the page stage before detection. Line direction first (it does not care about skew), then
 * the skew in the frame where lines run across, then up versus down on the levelled page, then at most one exact
 * half turn. One resampling in all.
 */

export interface NormalizedPage {
  /** The page upright and deskewed. */
  image: GrayImage;
  /** Clockwise quarter turn applied (the result's page rotation). */
  rotation: QuarterTurn;
  /** Skew of the content in degrees that was corrected (positive = it was turned clockwise). */
  skew: number;
  skewConfidence: number;
  /** Maps input-page coordinates to normalized-page coordinates (invert it to report boxes in source pixels). */
  transform: Affine;
  /** Orientation evidence, or null when orientation was not examined. */
  orientation: OrientationEstimate | null;
}

export interface NormalizeOptions {
  /** Look for quarter turns (default true). */
  orientation?: boolean;
  /** Estimate and correct skew (default true). */
  deskew?: boolean;
  /** Largest skew searched, degrees (default 10). */
  maxSkew?: number;
  /** Skews smaller than this are not resampled away (default 0.05°, under 1.5 px across a 200-dpi page; common practice). */
  minSkew?: number;
}

/** Make a page upright and level. Pure. */
export function normalizePage(img: GrayImage, options: NormalizeOptions = {}): NormalizedPage {
  const doOrient = options.orientation ?? true;
  const doDeskew = options.deskew ?? true;
  const lines = doOrient ? linesRunDown(glyphBoxes(img), img.width, img.height) : { sideways: false, horizontal: 0, vertical: 0 };
  let image = img;
  let transform: Affine = quarterTurnAffine(0, img.width, img.height);
  if (lines.sideways) {
    const q = rotateQuarter(img, 90);
    image = q.image;
    transform = q.transform;
  }
  const est = doDeskew ? estimateSkew(image, { maxAngle: options.maxSkew }) : { angle: 0, confidence: 0 };
  if (Math.abs(est.angle) >= (options.minSkew ?? 0.05)) {
    const r = rotateGray(image, -est.angle);
    image = r.image;
    transform = composeAffine(r.transform, transform);
  }
  let orientation: OrientationEstimate | null = null;
  let rotation: QuarterTurn = lines.sideways ? 90 : 0;
  if (doOrient) {
    orientation = orientationEstimate(lines, textBandEvidence(image));
    if (orientation.rotation !== rotation) {
      // A half turn keeps line angles, so the skew measured before it still holds.
      const h = rotateQuarter(image, 180);
      image = h.image;
      transform = composeAffine(h.transform, transform);
      rotation = orientation.rotation;
    }
  }
  return { image, rotation, skew: est.angle, skewConfidence: est.confidence, transform, orientation };
}

/** The page's quarter-turn rotation alone (normalizes the page to read it). Pure. */
export function detectOrientation(img: GrayImage): OrientationEstimate {
  const n = normalizePage(img);
  return n.orientation!;
}
