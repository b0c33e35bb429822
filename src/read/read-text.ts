import type { Box } from '../page/geometry.js';
import type { GrayImage } from '../page/raster.js';
import type { OcrMode, TextReading } from '../fields/types.js';
import { cropField, type FieldCrop, type Padding } from './crop.js';
import { cleanCrop, isBlank, type CleanupVariant } from './cleanup/pipeline.js';
import { sharedOcrEngine, type OcrEngine } from './ocr-engine.js';
import { ADAPTIVE, KEEP_LINES, STANDARD } from './variants.js';

export interface ReadTextOptions {
  /** Pixels, or "N%" of the box's shorter side. Default 4 (the schema default). */
  padding?: Padding;
  /** Page segmentation: line (default), block, word, char. */
  mode?: OcrMode;
  /** The only characters OCR may return. */
  allowed?: string;
  /** Says whether a reading is a valid value of the field's type; when it is not, further variants are tried. */
  accept?: (reading: TextReading) => boolean;
  /** The field is a comb (one cell per character). */
  comb?: boolean;
  /** Known page skew in degrees, when the page stage measured it; otherwise each crop estimates its own. */
  skew?: number;
  /** Cleanup recipes in the order to try; default: standard, then adaptive, then keep_lines. */
  variants?: readonly CleanupVariant[];
  /** OCR engine; default the process-wide one. */
  engine?: OcrEngine;
}

/** One cleanup variant tried on a field: no text here, so details can be logged without field values. */
export interface ReadAttempt {
  variant: string;
  /** The accept check's verdict; null when no check was given. */
  accepted: boolean | null;
  /** Tesseract's mean confidence 0..1. */
  confidence: number;
  /** Cleanup left no ink: OCR was not run. */
  blank: boolean;
}

export interface TextFieldReading {
  /** The reading kept: the first variant's, or the best accepted one of the later variants. */
  reading: TextReading;
  attempts: ReadAttempt[];
  crop: FieldCrop;
}

/** Clean a crop with one variant and OCR it. */
export async function readVariant(
  crop: FieldCrop,
  variant: CleanupVariant,
  options: Pick<ReadTextOptions, 'mode' | 'allowed' | 'comb' | 'skew' | 'engine'>,
): Promise<TextReading & { blank: boolean }> {
  const mode = options.mode ?? 'line';
  const cleaned = cleanCrop(crop.image, variant, { inner: crop.inner, mode, comb: options.comb, skew: options.skew });
  if (isBlank(cleaned)) return { kind: 'text', text: '', words: [], confidence: 1, variant: variant.name, blank: true };
  const engine = options.engine ?? sharedOcrEngine();
  const reading = await engine.read(cleaned, { mode, allowed: options.allowed });
  return { ...reading, variant: variant.name, blank: false };
}

/**
 * Read a text field: crop with padding from the full-resolution page, run the main cleanup variant and OCR it.
 * When `accept` rejects that reading (the typed value failed validation), every further variant is tried and the
 * accepted reading with the highest confidence is kept; if none is accepted the main reading stays. Each try is
 * recorded (variant, verdict, confidence) for the result's details.
 */
export async function readTextField(page: GrayImage, box: Box, options: ReadTextOptions = {}): Promise<TextFieldReading> {
  const crop = cropField(page, box, options.padding ?? 4);
  const variants = options.variants ?? [STANDARD, ADAPTIVE, KEEP_LINES];
  if (variants.length === 0) throw new Error('readTextField needs at least one cleanup variant');
  const attempts: ReadAttempt[] = [];
  const judge = (r: TextReading): boolean | null => (options.accept ? options.accept(r) : null);

  const { blank, ...first } = await readVariant(crop, variants[0], options);
  const firstOk = judge(first);
  attempts.push({ variant: variants[0].name, accepted: firstOk, confidence: first.confidence, blank });
  if (firstOk !== false) return { reading: first, attempts, crop };

  let best: TextReading | null = null;
  for (const variant of variants.slice(1)) {
    const { blank: b, ...r } = await readVariant(crop, variant, options);
    const ok = judge(r);
    attempts.push({ variant: variant.name, accepted: ok, confidence: r.confidence, blank: b });
    if (ok && (!best || r.confidence > best.confidence)) best = r;
  }
  return { reading: best ?? first, attempts, crop };
}
