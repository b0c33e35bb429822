import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { InferenceSession } from '../detect/onnx-runtime.js';
import { readOnnxMetadata } from '../detect/onnx-metadata.js';
import { configError, oneLine } from '../errors.js';
import type { GrayImage } from '../image/raster.js';
import { cellInput, type CellNormalisation, DEFAULT_NORMALISATION } from './digit-cell.js';
import { createCpuSession, Tensor } from '../detect/onnx-runtime.js';

/** The digit reader shipped in models/ (resolved from src/ or dist/ alike); card in models/README.md. */
export const DEFAULT_DIGIT_MODEL_PATH = fileURLToPath(new URL('../../models/digit-cells.onnx', import.meta.url));

/** What the reader made of one cell. */
export interface CellRead {
  /** The class: '0'..'9', 'empty' or 'not_digit'. */
  label: string;
  /** The digit when the class is one, else null. */
  digit: string | null;
  /** The model's probability of `label` (softmax). */
  confidence: number;
  /** Probability that the cell holds some digit (sum over '0'..'9'). */
  digitProbability: number;
}

export interface OpenDigitReaderOptions {
  /** onnxruntime intra-op threads; default 1 (cells are tiny: one core reads a field in about a millisecond). */
  intraOpThreads?: number;
}

/**
 * The handwritten-digit cell classifier (10 digits, empty cell, not a digit). Create one with DigitReader.open(),
 * share it across documents, and close() it when done; there is no process-wide instance.
 */
export class DigitReader {
  private constructor(
    private session: InferenceSession | null,
    readonly path: string,
    readonly id: string,
    readonly classNames: readonly string[],
    readonly inputSize: number,
    readonly normalisation: CellNormalisation,
  ) {}

  /** Load the model; every problem with the file is a configuration error naming it, on one line. */
  static async open(modelPath = DEFAULT_DIGIT_MODEL_PATH, options: OpenDigitReaderOptions = {}): Promise<DigitReader> {
    let bytes: Buffer;
    try {
      bytes = await readFile(modelPath);
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      throw configError(modelPath, code === 'ENOENT' ? 'digit model file not found' : `cannot read digit model file (${code ?? oneLine(err)})`, err);
    }
    let meta: Map<string, string>;
    try {
      meta = readOnnxMetadata(bytes);
    } catch (err) {
      throw configError(modelPath, `not an ONNX model (${oneLine(err)})`, err);
    }
    const classNames = parseClassNames(modelPath, meta.get('class_names'));
    const size = parseInputSize(modelPath, meta.get('input_size'));
    const normalisation = parseNormalisation(modelPath, meta.get('normalisation'));
    let session: InferenceSession;
    try {
      session = await createCpuSession(bytes, options.intraOpThreads ?? 1);
    } catch (err) {
      throw configError(modelPath, `onnxruntime cannot load the digit model: ${oneLine(err)}`, err);
    }
    const sha = createHash('sha256').update(bytes).digest('hex');
    return new DigitReader(session, modelPath, `${path.basename(modelPath)}@${sha.slice(0, 12)}`, classNames, size, normalisation);
  }

  /** Classify cells (gray crops, one per cell) in one batched run. */
  async readCells(cells: readonly GrayImage[]): Promise<CellRead[]> {
    const session = this.session;
    if (!session) throw configError(this.path, 'digit reader was closed');
    if (cells.length === 0) return [];
    const n = this.inputSize * this.inputSize;
    const input = new Float32Array(cells.length * n);
    cells.forEach((cell, i) => cellInput(cell, this.inputSize, this.normalisation, input.subarray(i * n, (i + 1) * n)));
    const feeds = { [session.inputNames[0]]: new Tensor('float32', input, [cells.length, 1, this.inputSize, this.inputSize]) };
    const output = (await session.run(feeds))[session.outputNames[0]];
    const probs = output.data as Float32Array;
    const k = this.classNames.length;
    if (probs.length !== cells.length * k) throw configError(this.path, `digit model returned ${probs.length} values for ${cells.length} cells x ${k} classes`);
    return cells.map((_, i) => {
      const p = probs.subarray(i * k, (i + 1) * k);
      let best = 0;
      let digitProbability = 0;
      for (let c = 0; c < k; c++) {
        if (p[c] > p[best]) best = c;
        if (/^[0-9]$/.test(this.classNames[c])) digitProbability += p[c];
      }
      const label = this.classNames[best];
      return { label, digit: /^[0-9]$/.test(label) ? label : null, confidence: p[best], digitProbability };
    });
  }

  /** Release the onnxruntime session; later reads fail with a clear error. Safe to call twice. */
  async close(): Promise<void> {
    const s = this.session;
    this.session = null;
    if (s) await s.release();
  }
}

function parseClassNames(file: string, text: string | undefined): string[] {
  let names: unknown;
  try {
    names = text === undefined ? undefined : JSON.parse(text);
  } catch {
    names = undefined;
  }
  if (!Array.isArray(names) || !names.every((n) => typeof n === 'string')) {
    throw configError(file, 'digit model metadata class_names is missing or not a JSON array of names');
  }
  for (let d = 0; d <= 9; d++) if (!names.includes(String(d))) throw configError(file, `digit model class_names lacks "${d}"`);
  return names;
}

function parseInputSize(file: string, text: string | undefined): number {
  const m = /^(\d+)x(\d+)$/.exec(text?.trim() ?? '');
  if (!m || m[1] !== m[2] || Number(m[1]) <= 0) throw configError(file, `digit model metadata input_size "${text ?? ''}" is not a square "NxN"`);
  return Number(m[1]);
}

function parseNormalisation(file: string, text: string | undefined): CellNormalisation {
  if (text === undefined) return DEFAULT_NORMALISATION;
  let raw: Record<string, unknown>;
  try {
    raw = JSON.parse(text) as Record<string, unknown>;
  } catch {
    throw configError(file, 'digit model metadata normalisation is not JSON');
  }
  const num = (key: string, fallback: number) => {
    const v = raw[key];
    if (v === undefined) return fallback;
    if (typeof v !== 'number' || !Number.isFinite(v)) throw configError(file, `digit model metadata normalisation.${key} is not a number`);
    return v;
  };
  return {
    paperPercentile: num('paper_percentile', DEFAULT_NORMALISATION.paperPercentile),
    darkPercentile: num('dark_percentile', DEFAULT_NORMALISATION.darkPercentile),
    minContrast: num('min_contrast', DEFAULT_NORMALISATION.minContrast),
  };
}
