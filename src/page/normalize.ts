import { estimateSkew } from './deskew.js';
import type { Affine } from './geometry.js';
import { composeAffine } from './geometry.js';
import type { OrientationEstimate } from './orientation.js';
import { glyphBoxes, linesRunDown, orientationFromGlyphs } from './orientation.js';
import type { GrayImage } from './raster.js';
import type { QuarterTurn } from './warp.js';
import { quarterTurnAffine, rotateGray, rotateQuarter } from './warp.js';

/**
 * Upright and level: the page stage before detection. Line direction first (it does not care about skew), then
 * the skew in the frame where lines run across, then up versus down on levelled glyphs, then one exact quarter
 * turn and one small resampling rotation.
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
  const boxes = doOrient ? glyphBoxes(img) : [];
  const sideways = doOrient && linesRunDown(boxes, img.width, img.height).sideways;
  const across = sideways ? rotateQuarter(img, 90).image : img;
  const est = doDeskew ? estimateSkew(across, { maxAngle: options.maxSkew }) : { angle: 0, confidence: 0 };
  const orientation = doOrient ? orientationFromGlyphs(boxes, img.width, img.height, est.angle) : null;
  const rotation: QuarterTurn = orientation?.rotation ?? 0;
  // A half turn keeps line angles, so the skew measured in the "across" frame holds for either choice.
  // The 90° turn was already made to measure the skew; reuse it rather than turning again.
  const quarter =
    rotation === 90 && sideways ? { image: across, transform: quarterTurnAffine(90, img.width, img.height) } : rotateQuarter(img, rotation);
  let image = quarter.image;
  let transform = quarter.transform;
  if (Math.abs(est.angle) >= (options.minSkew ?? 0.05)) {
    const r = rotateGray(image, -est.angle);
    image = r.image;
    transform = composeAffine(r.transform, transform);
  }
  return { image, rotation, skew: est.angle, skewConfidence: est.confidence, transform, orientation };
}
