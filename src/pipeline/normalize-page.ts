import type { Affine } from '../page/geometry.js';
import { IDENTITY, invertAffine } from '../page/geometry.js';
import { deskew } from '../page/deskew.js';
import type { GrayImage } from '../page/raster.js';

/** A page made upright and straight, with the way back to source pixels. */
export interface NormalizedPage {
  index: number;
  source: GrayImage;
  image: GrayImage;
  /** Clockwise quarter turn applied, degrees. */
  rotation: number;
  /** Skew that was removed, degrees. */
  skew: number;
  /** Maps normalized-page coordinates back to source pixels. */
  toSource: Affine;
}

export interface NormalizeOptions {
  deskew: boolean;
}

/** Remove small skew before detection and cropping, so crops do not catch a neighbouring line. */
export function normalizePage(index: number, source: GrayImage, options: NormalizeOptions): NormalizedPage {
  if (!options.deskew) return { index, source, image: source, rotation: 0, skew: 0, toSource: IDENTITY };
  const d = deskew(source);
  return { index, source, image: d.image, rotation: 0, skew: d.skew, toSource: invertAffine(d.transform) };
}
