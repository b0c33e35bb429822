import type { Detection } from '../detect/types.js';
import type { Affine, Point } from '../image/geometry.js';
import { applyAffine, center, invertAffine } from '../image/geometry.js';
import type { Alignment, LayoutRegion } from './alignment.js';
import { alignByDetections } from './align-detections.js';
import type { DetectionAlignOptions } from './align-detections.js';
import { alignByImage } from './align-image.js';
import type { ImageAlignOptions } from './align-image.js';
import type { GrayImage } from '../image/raster.js';

/**
 * Page -> reference alignment from two independent sources that check each other: detections matched to the
 * schema's regions, and direct registration to the blank reference image. When both exist and agree, the image
 * registration (which uses every pixel) gives the transform and the detections' agreement is the residual; when
 * they disagree, the image registration is restarted from the detections' estimate and the better-correlating
 * result wins; with one source, that one; with none, the plain size ratio.
 */

export interface AlignInputs {
  /** The page, upright and deskewed. */
  page: GrayImage;
  /** Size of the reference layout (the schema's page entry). */
  referenceSize: { width: number; height: number };
  /** Blank reference image of the layout, when the schema names one. */
  reference?: GrayImage;
  detections?: readonly Detection[];
  /** The schema's regions with their detector classes, in reference pixels. */
  regions?: readonly LayoutRegion[];
}

export interface AlignOptions {
  image?: ImageAlignOptions;
  detections?: DetectionAlignOptions;
  /** RMS disagreement (reference pixels) under which the two estimates count as agreeing (default 8, about 1 mm at 200 dpi; common practice). */
  agreeWithin?: number;
  /** Image correlation under which, when the two disagree, the detections are trusted instead (default 0.3). */
  minImageScore?: number;
}

/** Scale that stretches the reference onto the page, no shift: the answer when nothing else is known. */
export function sizeRatioAlignment(page: { width: number; height: number }, ref: { width: number; height: number }): Alignment {
  const refToPage: Affine = { a: page.width / ref.width, b: 0, c: 0, d: 0, e: page.height / ref.height, f: 0 };
  return { method: 'identity', transform: invertAffine(refToPage), refToPage, residual: null, inliers: 0, score: 0 };
}

/** RMS distance, in reference pixels, between points carried to the page by one estimate and back by the other. */
export function disagreement(a: Alignment, b: Alignment, points: readonly Point[]): number {
  if (points.length === 0) return 0;
  let s = 0;
  for (const p of points) {
    const q = applyAffine(b.transform, applyAffine(a.refToPage, p));
    s += (q[0] - p[0]) ** 2 + (q[1] - p[1]) ** 2;
  }
  return Math.sqrt(s / points.length);
}

function referencePoints(inputs: AlignInputs): Point[] {
  if (inputs.regions && inputs.regions.length > 0) return inputs.regions.map((r) => center(r.box));
  const { width: w, height: h } = inputs.referenceSize;
  return [[0.1 * w, 0.1 * h], [0.9 * w, 0.1 * h], [0.1 * w, 0.9 * h], [0.9 * w, 0.9 * h], [0.5 * w, 0.5 * h]];
}

/** Align an upright, deskewed page to its reference layout with every source available. Pure. */
export function alignPage(inputs: AlignInputs, options: AlignOptions = {}): Alignment {
  const agree = options.agreeWithin ?? 8;
  const byDet = inputs.detections && inputs.regions ? alignByDetections(inputs.detections, inputs.regions, options.detections) : null;
  if (!inputs.reference) return byDet ?? sizeRatioAlignment(inputs.page, inputs.referenceSize);

  let byImage = alignByImage(inputs.page, inputs.reference, options.image);
  if (!byDet) return byImage;
  const pts = referencePoints(inputs);
  let gap = disagreement(byDet, byImage, pts);
  if (gap > agree) {
    const restarted = alignByImage(inputs.page, inputs.reference, { ...options.image, initialRefToPage: byDet.refToPage });
    if (restarted.score > byImage.score) {
      byImage = restarted;
      gap = disagreement(byDet, byImage, pts);
    }
  }
  if (gap <= agree) {
    return { ...byImage, method: 'image+detections', residual: gap, inliers: byDet.inliers, pairs: byDet.pairs };
  }
  if (byImage.score < (options.minImageScore ?? 0.3)) return { ...byDet, residual: gap };
  // Still apart: the image registration is the one whose correlation was checked over the whole page; the
  // detections' disagreement is reported as the residual so that the caller can send fields to review.
  return { ...byImage, residual: gap, inliers: 0 };
}
