import type { z } from 'zod';
import type { ReasonCode } from './reasons.js';

/** How a field's pixels become evidence: OCR text, fill ratio of printed boxes, or ink coverage. */
export type ReaderKind = 'ocr' | 'mark' | 'ink';

/** Tesseract page-segmentation choice per field: one line, a block of lines, one word, one character. */
export type OcrMode = 'line' | 'block' | 'word' | 'char';

export interface OcrWord {
  text: string;
  /** 0..1 (tesseract's 0..100 divided by 100). */
  confidence: number;
}

export interface TextReading {
  kind: 'text';
  text: string;
  words: OcrWord[];
  /** 0..1 mean confidence tesseract reports for the whole crop. */
  confidence: number;
  /** Name of the crop-cleanup variant that produced this text. */
  variant?: string;
}

export interface MarkReading {
  kind: 'marks';
  /** One entry per printed box: key is the part key (the field name, or the choice value). */
  marks: { key: string; fillRatio: number; boxFound: boolean }[];
}

export interface InkReading {
  kind: 'ink';
  /** Share of dark pixels in the area after border removal, 0..1. */
  coverage: number;
}

export type Reading = TextReading | MarkReading | InkReading;

export type FieldValue = string | number | boolean | string[] | null;

/** What a field type makes of a reading (or of a reviewer's typed correction). */
export interface Interpretation {
  /** Normalized value (ISO 8601 date, E.164 phone, ...), null when nothing usable was read. */
  value: FieldValue;
  /** Further normalized forms worth keeping (e.g. a phone number's national format). */
  extra?: Record<string, string | number | boolean>;
  /** valid: a value that passed the type's checks; empty: nothing there; invalid: text that fails the checks;
   *  ambiguous: the evidence sits between two answers (e.g. a half-ticked box). */
  outcome: 'valid' | 'invalid' | 'empty' | 'ambiguous';
  /** 0..1 trust from the type's own evidence and checks (repairs lower it); 1 when nothing argues against. */
  confidence: number;
  /** Stable reason codes from reasons.ts, e.g. repaired_digits, invalid_date, ambiguous_mark. */
  reasons: ReasonCode[];
}

/** One part of a field on the page: most fields have one, a choice group has one per printed box. */
export interface FieldPart {
  key: string;
  /** [x, y, w, h] on the reference page, when the schema gives one. */
  region?: [number, number, number, number];
}

export interface FieldTypeContext {
  /** "Today" for range checks such as not-in-the-future; injectable for reproducible tests. */
  today: Date;
}

/**
 * A field type: one module under src/fields/, registered once in registry.ts.
 * O is the type's own options, parsed from the schema's `options` by `options`.
 */
export interface FieldType<O = unknown> {
  readonly name: string;
  readonly description: string;
  /** zod object for this type's `options` in the schema file; every key has a default or is optional. */
  readonly options: z.ZodType<O>;
  readonly reader: ReaderKind;
  /** OCR settings this type prefers when the schema field gives none (e.g. digits and separators for dates). */
  ocrDefaults?(options: O): { mode?: OcrMode; allowed?: string };
  /** Parts to locate; default is one part keyed by the field name with the field's region. */
  parts?(options: O, fieldName: string, region?: [number, number, number, number]): FieldPart[];
  interpret(reading: Reading, options: O, context: FieldTypeContext): Interpretation;
  /**
   * What a reviewer may type as a correction, in plain words and naming every accepted format, e.g. "a date as
   * MM/DD/YYYY or YYYY-MM-DD". Shown on the review page and in every message that refuses a correction.
   */
  acceptedInput(options: O): string;
  /** A reviewer's typed correction, checked and normalized like a reading at full confidence. */
  parseCorrection(text: string, options: O, context: FieldTypeContext): Interpretation;
}
