import type { Affine, Box } from '../image/geometry.js';

/** How a page was put onto its reference layout. */
export type AlignmentMethod = 'detections' | 'image' | 'image+detections' | 'identity';

/** The page-to-reference transform and the evidence behind it. */
export interface Alignment {
  method: AlignmentMethod;
  /** Maps page coordinates to reference-layout coordinates. */
  transform: Affine;
  /** The inverse: reference coordinates to page coordinates (how schema regions are carried onto the page). */
  refToPage: Affine;
  /**
   * Reference pixels: for 'detections', the RMS distance between matched detection centres and their regions'
   * centres after the transform; for 'image+detections', the RMS disagreement of the two estimates at the
   * regions' centres; null when nothing independent measured it.
   */
  residual: number | null;
  /** Detection/region pairs that support the transform (0 for image registration alone). */
  inliers: number;
  /**
   * 0..1 quality: for image registration the zero-mean normalized cross-correlation of the page's ink with the
   * reference's after warping; for detections the share of regions matched.
   */
  score: number;
  /** Detection index -> region index for the inlier pairs (detections method only). */
  pairs?: Array<[number, number]>;
}

/** A box on the reference layout that a detector class should find (a schema field's region). */
export interface LayoutRegion {
  box: Box;
  className: string;
}
