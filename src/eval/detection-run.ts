import { performance } from 'node:perf_hooks';
import type { Detector } from '../detect/types.js';
import { FormgleanError, configError } from '../errors.js';
import type { GrayImage } from '../image/raster.js';
import { decodeDocument } from '../input/decode.js';
import { type ClassEvaluation, evaluateClass, meanDefined } from './detection-ap.js';
import type { DetectionDataset } from './detection-dataset.js';
import type { GroundTruthBox, ScoredBox } from './detection-match.js';
import { percentile } from './percentile.js';

/**
 * Run a detector over a labeled COCO set and score it per class.
 *
 * Detections are kept down to a score of 0.001 so the precision–recall curve reaches as far in recall as the model
 * can (the usual floor when computing AP, common practice); precision and recall "at threshold" use the operating
 * threshold. COCO caps detections at 100 per image; here the detector's own cap (300) applies, since a form page can
 * hold more than 100 entry areas.
 */
export const AP_SCORE_FLOOR = 0.001;

export interface ClassReport extends ClassEvaluation {
  name: string;
}

export interface DetectorEvalReport {
  model: { path: string; id: string; sha256: string; inputWidth: number; inputHeight: number };
  data: { path: string; images: number; boxes: number };
  scoreThreshold: number;
  iouThreshold: 0.5;
  classes: ClassReport[];
  /** Means over classes with ground truth. */
  mean: { ap50: number | null; ap50to95: number | null; vocAllPointAp50: number | null };
  /** Detector time per image (letterbox + inference + decoding + NMS), decoding of the image file excluded. */
  timing: { images: number; msPerImageMedian: number; msPerImageP90: number };
}

export interface EvaluateDetectorOptions {
  /** Operating threshold for precision/recall; default: the detector's own. */
  scoreThreshold?: number;
  /** Called after each image (progress). */
  onImage?: (done: number, total: number) => void;
}

export async function evaluateDetector(
  detector: Detector,
  dataset: DetectionDataset,
  options: EvaluateDetectorOptions = {},
): Promise<DetectorEvalReport> {
  const scoreThreshold = options.scoreThreshold ?? detector.defaults?.scoreThreshold ?? 0.25;
  const missing = dataset.categoryNames.filter((n) => !detector.classNames.includes(n));
  if (missing.length > 0) {
    throw configError(
      dataset.file,
      `categories ${missing.map((n) => `"${n}"`).join(', ')} are not classes of ${detector.id} (it has ${detector.classNames.join(', ')})`,
    );
  }
  const truth = new Map<string, GroundTruthBox[]>(dataset.categoryNames.map((n) => [n, []]));
  for (const b of dataset.boxes) truth.get(b.categoryName)!.push({ imageId: b.imageId, box: b.box, crowd: b.crowd });
  const found = new Map<string, ScoredBox[]>(dataset.categoryNames.map((n) => [n, []]));

  const times: number[] = [];
  for (const [i, image] of dataset.images.entries()) {
    const page = await readPage(image.path);
    if (page.width !== image.width || page.height !== image.height) {
      throw configError(
        dataset.file,
        `image ${image.id} (${image.path}) is ${page.width}x${page.height}, the data says ${image.width}x${image.height}`,
      );
    }
    const t0 = performance.now();
    const detections = await detector.detect(page, { scoreThreshold: Math.min(AP_SCORE_FLOOR, scoreThreshold) });
    times.push(performance.now() - t0);
    for (const d of detections) found.get(d.className)?.push({ imageId: image.id, box: d.box, score: d.score });
    options.onImage?.(i + 1, dataset.images.length);
  }

  const classes = dataset.categoryNames.map((name) => ({
    name,
    ...evaluateClass(truth.get(name)!, found.get(name)!, { scoreThreshold }),
  }));
  return {
    model: {
      path: detector.path,
      id: detector.id,
      sha256: detector.sha256,
      inputWidth: detector.inputWidth,
      inputHeight: detector.inputHeight,
    },
    data: { path: dataset.file, images: dataset.images.length, boxes: dataset.boxes.length },
    scoreThreshold,
    iouThreshold: 0.5,
    classes,
    mean: {
      ap50: meanDefined(classes.map((c) => c.ap50)),
      ap50to95: meanDefined(classes.map((c) => c.ap50to95)),
      vocAllPointAp50: meanDefined(classes.map((c) => c.vocAllPointAp50)),
    },
    timing: { images: times.length, msPerImageMedian: percentile(times, 50), msPerImageP90: percentile(times, 90) },
  };
}

/** First page of a labeled image; a bad image is a problem with the data set (exit 2), named by its path. */
async function readPage(file: string): Promise<GrayImage> {
  try {
    const doc = await decodeDocument(file);
    return doc.pages[0];
  } catch (err) {
    if (err instanceof FormgleanError) throw new FormgleanError(err.message, { exitCode: 2, cause: err });
    throw err;
  }
}

