import { composeH, IDENTITY_H, rotateH, scaleH, translateH, type Homography } from './homography.js';
import { REFERENCE_DPI } from './layout-model.js';
import type { Rng } from './prng.js';

export type DegradeLevel = 'none' | 'light' | 'heavy';

/** Everything a simulated scan does to a page, drawn once per page so it can be recorded in the truth. */
export interface ScanParams {
  dpi: number;
  width: number;
  height: number;
  /** Reference page pixels → output pixels. */
  transform: Homography;
  /** 0 or 180: the page was fed upside down. */
  rotation: 0 | 180;
  /** Small rotation in degrees, positive = clockwise on screen. */
  skew: number;
  blurSigma: number;
  noiseSigma: number;
  saltPepper: number;
  /** Brightness change across the page: multiplicative gain at the corners, 1 = even. */
  shading: [number, number, number, number];
  /** Paper gray level (255 = white). */
  paper: number;
  jpegQuality: number | null;
}

export interface ScanOptions {
  level: DegradeLevel;
  /** Fixed output resolution; when absent, heavy scans draw one in 150..300 and lighter ones keep the reference. */
  dpi?: number;
  /** Share of pages fed upside down. */
  upsideDownRate: number;
  /** false: no sensor noise or specks (small files for demo scans); default true. */
  noise?: boolean;
}

/** Ranges per level. Heavy follows the brief for training (rotation ±3°, JPEG 30–90, 150–300 DPI); light is an
 *  ordinary office scan (common practice). */
const RANGES = {
  light: { rot: 1, scale: 0.01, persp: 0.000004, shift: 10, blur: [0, 0.7], noise: [0, 4], sp: [0, 0.0003], shade: 0.04, jpeg: [70, 92], jpegRate: 0.5 },
  heavy: { rot: 3, scale: 0.03, persp: 0.00002, shift: 30, blur: [0, 1.4], noise: [2, 12], sp: [0, 0.003], shade: 0.15, jpeg: [30, 90], jpegRate: 0.7 },
} as const;

export function drawScanParams(rng: Rng, refWidth: number, refHeight: number, o: ScanOptions): ScanParams {
  const dpi = o.dpi ?? (o.level === 'heavy' ? rng.pick([150, 200, 200, 240, 300]) : REFERENCE_DPI);
  const k = dpi / REFERENCE_DPI;
  const width = Math.round(refWidth * k);
  const height = Math.round(refHeight * k);
  const rotation: 0 | 180 = o.level !== 'none' && rng.chance(o.upsideDownRate) ? 180 : 0;
  if (o.level === 'none') {
    return { dpi, width, height, transform: k === 1 ? IDENTITY_H : scaleH(k), rotation: 0, skew: 0, blurSigma: 0, noiseSigma: 0, saltPepper: 0, shading: [1, 1, 1, 1], paper: 255, jpegQuality: null };
  }
  const R = RANGES[o.level];
  const skew = rng.range(-R.rot, R.rot);
  const s = k * (1 + rng.range(-R.scale, R.scale));
  const px = rng.range(-R.persp, R.persp);
  const py = rng.range(-R.persp, R.persp);
  const cx = refWidth / 2;
  const cy = refHeight / 2;
  // Keystone: a small projective term about the page centre (moved to the origin first), as when the sheet is not
  // flat on the glass.
  const keystone: Homography = [1, 0, 0, 0, 1, 0, px, py, 1];
  const transform = composeH(
    translateH(-cx, -cy),
    keystone,
    scaleH(s),
    rotateH(skew + rotation),
    translateH(width / 2 + rng.range(-R.shift, R.shift) * k, height / 2 + rng.range(-R.shift, R.shift) * k),
  );
  const shade = () => 1 - rng.range(0, R.shade);
  return {
    dpi,
    width,
    height,
    transform,
    rotation,
    skew: Math.round(skew * 1000) / 1000,
    blurSigma: rng.range(R.blur[0], R.blur[1]),
    noiseSigma: o.noise === false ? 0 : rng.range(R.noise[0], R.noise[1]),
    saltPepper: o.noise === false ? 0 : rng.range(R.sp[0], R.sp[1]),
    shading: [shade(), shade(), shade(), shade()],
    paper: rng.int(o.level === 'heavy' ? 215 : 238, 255),
    jpegQuality: rng.chance(R.jpegRate) ? rng.int(R.jpeg[0], R.jpeg[1]) : null,
  };
}
