import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';

/** One detected entry area, in the pixels of the page it was detected on. */
export interface Detection {
  box: Box;
  classId: number;
  className: string;
  score: number;
}

export interface DetectOptions {
  /** Minimum class score kept (before NMS). */
  scoreThreshold?: number;
  /** IoU above which a lower-scored box of the same class is suppressed. */
  iouThreshold?: number;
  /** Cap on detections returned per page. */
  maxDetections?: number;
}

/** A loaded detector: one onnxruntime session per process, reused for every page. */
export interface Detector {
  /** Stable id: file name + sha256 of the model file. */
  readonly id: string;
  readonly sha256: string;
  readonly path: string;
  readonly classNames: readonly string[];
  readonly inputWidth: number;
  readonly inputHeight: number;
  /** Options detect() uses when the caller leaves them out (the score threshold may come from the model). */
  readonly defaults?: Readonly<Required<DetectOptions>>;
  detect(page: GrayImage, options?: DetectOptions): Promise<Detection[]>;
  close(): Promise<void>;
}
