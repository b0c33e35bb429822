import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { createCpuSession, type InferenceSession, Tensor } from './onnx-runtime.js';
import { configError, oneLine } from '../errors.js';
import { clampBox, transformBox } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { resolveClassNames } from './class-names.js';
import { type OutputLayout, OUTPUT_LAYOUTS, decodeOutput, layoutsFitting } from './decode.js';
import { type LetterboxAlign, letterbox } from './letterbox.js';
import { nonMaxSuppression } from './nms.js';
import { readOnnxMetadata } from './onnx-metadata.js';
import type { DetectOptions, Detection, Detector } from './types.js';

/**
 * Defaults for detect():
 * - scoreThreshold 0.25: the usual default confidence cut of single-stage detectors at prediction time (common
 *   practice). A model whose metadata carries `operating_threshold` (ours does: the threshold its card reports
 *   recall at) uses that instead.
 * - iouThreshold 0.5: entry areas of one class on a form do not overlap, so two same-class boxes overlapping by more
 *   than half are one element found twice (0.5 is the common NMS setting, common practice).
 * - maxDetections 300: the usual per-image cap (common practice); a dense form page has well under that many
 *   entry areas, so the cap only guards against a broken model flooding the later stages.
 */
export const DEFAULT_DETECT_OPTIONS: Required<DetectOptions> = {
  scoreThreshold: 0.25,
  iouThreshold: 0.5,
  maxDetections: 300,
};

export interface LoadDetectorOptions {
  /** onnxruntime intra-op threads (default: onnxruntime's own choice). */
  intraOpThreads?: number;
  /** JSON array of class names, used instead of the model's metadata or side file. */
  classNamesFile?: string;
}

// One session per model file per process: sessions are costly to create and safe to reuse for every page.
// Keyed by absolute path; the options of the first load win.
const sessions = new Map<string, Promise<Detector>>();

/**
 * Load an ONNX detector (grayscale input [1, 1, H, W], float 0..1; one of the output layouts in decode.ts).
 * Every problem with the file is a configError naming it, on one line.
 */
export function loadDetector(modelPath: string, options: LoadDetectorOptions = {}): Promise<Detector> {
  const key = path.resolve(modelPath);
  let pending = sessions.get(key);
  if (!pending) {
    pending = openDetector(modelPath, key, options);
    sessions.set(key, pending);
    pending.catch(() => sessions.delete(key));
  }
  return pending;
}

async function openDetector(modelPath: string, key: string, options: LoadDetectorOptions): Promise<Detector> {
  let bytes: Buffer;
  try {
    bytes = await readFile(modelPath);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw configError(modelPath, code === 'ENOENT' ? 'model file not found' : `cannot read model file (${code ?? oneLine(err)})`, err);
  }
  if (bytes.length === 0) throw configError(modelPath, 'model file is empty');
  const sha256 = createHash('sha256').update(bytes).digest('hex');

  let metadata: Map<string, string>;
  try {
    metadata = readOnnxMetadata(bytes);
  } catch (err) {
    throw configError(modelPath, `not an ONNX model (${oneLine(err)})`, err);
  }
  const classNames = await resolveClassNames(modelPath, metadata, options.classNamesFile);
  const layoutHint = readLayoutHint(modelPath, metadata);
  const align = readAlign(modelPath, metadata);
  const defaults = { ...DEFAULT_DETECT_OPTIONS, scoreThreshold: readOperatingThreshold(modelPath, metadata) };

  let session: InferenceSession;
  try {
    session = await createCpuSession(bytes, options.intraOpThreads);
  } catch (err) {
    throw configError(modelPath, `onnxruntime cannot load the model: ${oneLine(err)}`, err);
  }

  try {
    const [inputWidth, inputHeight] = inputSize(modelPath, session, metadata);
    checkOutput(modelPath, session, classNames.length, layoutHint);
    return new OnnxDetector(key, modelPath, sha256, classNames, inputWidth, inputHeight, { layoutHint, align }, defaults, session);
  } catch (err) {
    await session.release();
    throw err;
  }
}

function readLayoutHint(file: string, metadata: ReadonlyMap<string, string>): OutputLayout | undefined {
  const hint = metadata.get('output_layout');
  if (hint === undefined) return undefined;
  if (!(OUTPUT_LAYOUTS as readonly string[]).includes(hint)) {
    throw configError(file, `metadata output_layout "${hint}" is not one of ${OUTPUT_LAYOUTS.join(', ')}`);
  }
  return hint as OutputLayout;
}

function readOperatingThreshold(file: string, metadata: ReadonlyMap<string, string>): number {
  const text = metadata.get('operating_threshold');
  if (text === undefined) return DEFAULT_DETECT_OPTIONS.scoreThreshold;
  const t = Number(text);
  if (!(t > 0 && t < 1)) throw configError(file, `metadata operating_threshold "${text}" is not a number between 0 and 1`);
  return t;
}

function readAlign(file: string, metadata: ReadonlyMap<string, string>): LetterboxAlign {
  const align = metadata.get('letterbox_align') ?? 'top-left';
  if (align !== 'top-left' && align !== 'center') {
    throw configError(file, `metadata letterbox_align "${align}" is not "top-left" or "center"`);
  }
  return align;
}

/** Width and height from the input shape [1, 1, H, W]; metadata `input_size` ("WxH") when the dims are symbolic. */
function inputSize(file: string, session: InferenceSession, metadata: ReadonlyMap<string, string>): [number, number] {
  if (session.inputNames.length !== 1) throw configError(file, `expected one input, found ${session.inputNames.length}`);
  const meta = session.inputMetadata[0];
  if (!meta.isTensor || meta.type !== 'float32') throw configError(file, 'input is not a float32 tensor');
  const dims = meta.shape;
  if (dims.length !== 4 || (typeof dims[1] === 'number' && dims[1] !== 1) || (typeof dims[0] === 'number' && dims[0] !== 1)) {
    throw configError(file, `input shape [${dims.join(', ')}] is not a grayscale [1, 1, H, W]`);
  }
  const declared = metadata.get('input_size');
  let fromMeta: [number, number] | undefined;
  if (declared !== undefined) {
    const m = /^(\d+)x(\d+)$/.exec(declared.trim());
    if (!m || Number(m[1]) <= 0 || Number(m[2]) <= 0) throw configError(file, `metadata input_size "${declared}" is not "WxH"`);
    fromMeta = [Number(m[1]), Number(m[2])];
  }
  const [h, w] = [dims[2], dims[3]];
  if (typeof w === 'number' && typeof h === 'number' && w > 0 && h > 0) {
    if (fromMeta && (fromMeta[0] !== w || fromMeta[1] !== h)) {
      throw configError(file, `metadata input_size ${declared} disagrees with the input shape ${w}x${h}`);
    }
    return [w, h];
  }
  if (!fromMeta) throw configError(file, 'input height/width are symbolic and metadata has no input_size "WxH"');
  return fromMeta;
}

function checkOutput(file: string, session: InferenceSession, classCount: number, hint: OutputLayout | undefined): void {
  if (session.outputNames.length < 1) throw configError(file, 'model has no output');
  const meta = session.outputMetadata[0];
  if (!meta.isTensor || meta.type !== 'float32') throw configError(file, 'first output is not a float32 tensor');
  if (meta.shape.length === 0) return; // shape unknown until run time
  const fitting = layoutsFitting(meta.shape, classCount);
  if (fitting.length === 0 || (hint && !fitting.includes(hint))) {
    throw configError(
      file,
      `unexpected output shape [${meta.shape.join(', ')}] for ${classCount} class names: expected [1, ${4 + classCount}, N], [1, N, ${5 + classCount}] or [1, N, 6]`,
    );
  }
}

class OnnxDetector implements Detector {
  readonly id: string;
  readonly path: string;

  constructor(
    private readonly cacheKey: string,
    modelPath: string,
    readonly sha256: string,
    readonly classNames: readonly string[],
    readonly inputWidth: number,
    readonly inputHeight: number,
    private readonly feed: { layoutHint: OutputLayout | undefined; align: LetterboxAlign },
    readonly defaults: Readonly<Required<DetectOptions>>,
    private session: InferenceSession | undefined,
  ) {
    this.path = modelPath;
    this.id = `${path.basename(modelPath)}@${sha256.slice(0, 12)}`;
  }

  async detect(page: GrayImage, options: DetectOptions = {}): Promise<Detection[]> {
    const session = this.session;
    if (!session) throw configError(this.path, 'detector was closed');
    const opts = { ...this.defaults, ...definedOnly(options) };
    if (page.width <= 0 || page.height <= 0 || page.data.length !== page.width * page.height) {
      throw new Error(`page raster ${page.width}x${page.height} with ${page.data.length} bytes is not a grayscale image`);
    }
    const boxed = await letterbox(page, this.inputWidth, this.inputHeight, this.feed.align);
    const input = new Tensor('float32', boxed.tensor, [1, 1, this.inputHeight, this.inputWidth]);
    const outputs = await session.run({ [session.inputNames[0]]: input });
    const output = outputs[session.outputNames[0]] as Tensor;
    let candidates;
    try {
      if (output.type !== 'float32') throw new Error(`output type ${output.type}, expected float32`);
      candidates = decodeOutput(output.data as Float32Array, output.dims, this.classNames.length, opts.scoreThreshold, this.feed.layoutHint);
    } catch (err) {
      throw configError(this.path, oneLine(err), err);
    } finally {
      for (const value of Object.values(outputs)) value.dispose();
    }
    const kept = nonMaxSuppression(candidates, opts.iouThreshold, opts.maxDetections);
    const detections: Detection[] = [];
    for (const c of kept) {
      const box = clampBox(transformBox(boxed.toSource, c.box), page.width, page.height);
      if (box.w <= 0 || box.h <= 0) continue;
      detections.push({ box, classId: c.classId, className: this.classNames[c.classId], score: c.score });
    }
    return detections;
  }

  async close(): Promise<void> {
    const session = this.session;
    if (!session) return;
    this.session = undefined;
    sessions.delete(this.cacheKey);
    await session.release();
  }
}

function definedOnly(options: DetectOptions): DetectOptions {
  const out: DetectOptions = {};
  if (options.scoreThreshold !== undefined) out.scoreThreshold = options.scoreThreshold;
  if (options.iouThreshold !== undefined) out.iouThreshold = options.iouThreshold;
  if (options.maxDetections !== undefined) out.maxDetections = options.maxDetections;
  return out;
}

