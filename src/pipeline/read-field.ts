import type { FieldType, FieldTypeContext, Interpretation, Reading } from '../fields/types.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import { cropField, type Padding } from '../read/crop.js';
import { writingPastEdge } from '../read/edge-overflow.js';
import { measureBox } from '../read/mark-box.js';
import { inkCoverage } from '../read/marks.js';
import { withoutPrintedLabel } from '../read/printed-label.js';
import { readTextField } from '../read/read-text.js';
import type { LocatedField, LocatedPart } from '../locate/locate-fields.js';
import type { BlankPart } from '../read/blank-crop.js';
import { readDigitComb } from '../read/digit-comb.js';
import type { DigitReader } from '../read/digit-reader.js';
import type { OcrEngine } from '../read/ocr-engine.js';
import { crossCheckDigits, isDigitComb } from './digit-cross-check.js';
import { scriptMeasures } from '../read/script-measures.js';
import { scriptInputs, type ScriptDecision, type ScriptInputs } from '../fields/script.js';
import { carriesDigits } from '../fields/digit-scrutiny.js';
import { glyphSecondRead, secondRead, type SecondRead } from './second-read.js';
import { round3 } from '../result/rounding.js';

/** What reading one located field produced, before scoring. */
export interface FieldReadOutcome {
  reading: Reading | null;
  interpretation: Interpretation | null;
  /** Cleanup variants tried, mark measurements: kept in the result's details (no field values). */
  details: Record<string, unknown>;
  /** The entry's own script evidence, for an OCR field with ink to measure (src/fields/script.ts). */
  scriptEntry?: ScriptInputs;
  /** Printed or handwritten: set once the whole form is read (settleScripts). */
  script?: ScriptDecision;
  /** A second, independent read of a valid value with digits, asked for when the entry is handwritten. */
  recheck?: () => Promise<SecondRead>;
}

export interface ReadFieldContext {
  page: GrayImage;
  /** The page with the printed form removed (dropout), read by OCR when given; marks and ink use `page`, since a
   *  checkbox is found by its printed square. */
  ocrPage?: GrayImage;
  padding: Padding;
  typeContext: FieldTypeContext;
  /** The schema page's blank image, when it names one: marks are then measured as ink added over it. */
  reference?: GrayImage;
  /** Reads digit combs cell by cell beside Tesseract (digit-cross-check.ts); absent: Tesseract alone. */
  digitReader?: DigitReader;
  /** The run's OCR engine (the caller creates and closes it). */
  ocr: OcrEngine;
}

/**
 * Ink coverage (read/marks.ts inkCoverage) above which an OCR field that read as empty is taken to hold writing
 * OCR could not read. Measured on the development set (seeds 800101-800302, light scans): of 192 truly blank OCR
 * fields 189 had 0 and 3 had 0.0083-0.0088 (printed date separators); of 102 filled fields OCR returned nothing
 * for (mostly handwriting-style), 97 had 0.0015-0.055. So a blank read over this goes to review instead of being
 * accepted as blank.
 */
export const UNREAD_INK = 0.001;

/**
 * Read one located field by its type's reader: OCR with cleanup variants (a second variant when the typed value fails
 * validation), fill ratio of each printed box, or ink coverage.
 */
export async function readLocatedField(
  located: LocatedField,
  type: FieldType<any>,
  options: unknown,
  ctx: ReadFieldContext,
): Promise<FieldReadOutcome> {
  const { field } = located;
  const padding = field.padding ?? ctx.padding;
  if (type.reader === 'ocr') {
    const box = located.parts[0]?.box;
    if (!box) return { reading: null, interpretation: null, details: {} };
    const hints = { ...(type.ocrDefaults?.(options) ?? {}), ...(field.ocr ?? {}) };
    const blank = blankPart(ctx, located.parts[0]);
    const read = await readTextField(ctx.ocrPage ?? ctx.page, box, {
      engine: ctx.ocr,
      padding,
      mode: hints.mode ?? 'line',
      allowed: hints.allowed,
      comb: field.class === 'comb_field',
      blank,
      // The page was deskewed as a whole; crops need no skew estimate of their own.
      skew: 0,
      accept: (r) => {
        const i = type.interpret(withoutPrintedLabel(r, field.label), options, ctx.typeContext);
        return i.outcome === 'valid' || (i.outcome === 'empty' && !field.required);
      },
    });
    let reading = withoutPrintedLabel(read.reading, field.label);
    // Tesseract's own read: its word confidences are evidence of print or handwriting, whichever reader's value is kept.
    const ocrReading = reading;
    let interpretation = type.interpret(reading, options, ctx.typeContext);
    const details: Record<string, unknown> = { attempts: read.attempts };
    if (reading !== read.reading) details.droppedLabel = true;
    if (ctx.digitReader && isDigitComb(field.class === 'comb_field', hints.allowed, (options as { pattern?: unknown } | null)?.pattern)) {
      // The scanned page, not the dropout one: cells are cut at the printed separators.
      // The comb's box count: the schema's `cells` (schema from-pdf drafts it from the widget's maximum length, which
      // a comb divides its box into evenly: ISO 32000-1 §12.7.4.3), else a text comb's maximum length.
      const cells = field.cells ?? (options as { maxLength?: number } | null)?.maxLength;
      const digits = await readDigitComb(cropField(ctx.page, box, padding), ctx.digitReader, { cells });
      if (digits) {
        const firstAccepted = read.attempts[0]?.accepted ?? null;
        const checked = crossCheckDigits({ reading, interpretation, firstAccepted }, digits, (r) => type.interpret(r, options, ctx.typeContext));
        ({ reading, interpretation } = checked);
        details.digitCells = checked.details;
      }
    }
    // Print or handwriting is decided once the whole form is read (the form's other entries are evidence too:
    // src/fields/script.ts decideScripts); here the entry's own measures are taken, from the ink in the located box
    // on the scanned page (the dropout page has lost strokes that crossed printed rules) and OCR's word confidences.
    let scriptEntry: ScriptInputs | undefined;
    if (interpretation.outcome !== 'empty') {
      const measures = scriptMeasures(cropField(ctx.page, box, 0).image);
      if (measures) {
        scriptEntry = scriptInputs(measures, ocrReading);
        details.script = { ...scriptEntry, wordConfidence: scriptEntry.wordConfidence === null ? null : round3(scriptEntry.wordConfidence), components: measures.components };
      }
    }
    // A handwritten digit misread still makes a valid value, so such a value needs a second reader's agreement
    // (src/pipeline/second-read.ts), asked for once the form's scripts are decided: the digit reader's cells where
    // it read a comb, else the digit reader glyph by glyph, else (no digit reader) a differently cleaned crop.
    let recheck: FieldReadOutcome['recheck'];
    if (interpretation.outcome === 'valid' && carriesDigits(type.name, hints.allowed, (options as { pattern?: unknown } | null)?.pattern)) {
      const cells = details.digitCells as { agree: boolean } | undefined;
      const kept = { reading, interpretation };
      const digitReader = ctx.digitReader;
      recheck = cells
        ? async () => ({ agree: cells.agree, variant: 'digit_cells' })
        : digitReader
          ? () => glyphSecondRead(cropField(ctx.page, box, 0).image, kept, digitReader)
          : () =>
            secondRead(ctx.ocrPage ?? ctx.page, box, kept, { engine: ctx.ocr, padding, mode: hints.mode ?? 'line', allowed: hints.allowed, comb: field.class === 'comb_field', blank }, (r) =>
              type.interpret(withoutPrintedLabel(r, field.label), options, ctx.typeContext),
            );
    }
    if (blank && interpretation.outcome !== 'empty' && writingPastEdge(ctx.page, blank)) {
      // The value may be cut off at the region's edge: never accepted as read.
      interpretation = { ...interpretation, outcome: 'ambiguous', reasons: [...interpretation.reasons, 'writing_past_edge'] };
    }
    if (interpretation.outcome === 'empty') {
      // Nothing read is not the same as nothing written: look for pen strokes on the scanned page.
      const ink = inkCoverage(cropField(ctx.page, box, padding).image);
      details.ink = round3(ink);
      if (ink > UNREAD_INK) {
        interpretation = { value: null, outcome: 'ambiguous', confidence: 0, reasons: ['ambiguous_unread_writing'] };
      }
    }
    return { reading, interpretation, details, ...(scriptEntry ? { scriptEntry } : {}), ...(recheck && interpretation.outcome === 'valid' ? { recheck } : {}) };
  }

  const boxes = located.parts.filter((p): p is typeof p & { box: Box } => p.box !== null);
  if (boxes.length === 0) return { reading: null, interpretation: null, details: {} };

  if (type.reader === 'mark') {
    const measured = located.parts.map((part) => {
      if (!part.box) return { key: part.key, fillRatio: 0, boxFound: false, method: 'none' };
      const m = measureBox(ctx.page, part.box, padding, blankPart(ctx, part));
      return { key: part.key, fillRatio: round3(m.fillRatio), boxFound: m.boxFound, method: m.method };
    });
    const reading: Reading = { kind: 'marks', marks: measured.map(({ key, fillRatio, boxFound }) => ({ key, fillRatio, boxFound })) };
    return { reading, interpretation: type.interpret(reading, options, ctx.typeContext), details: { marks: measured } };
  }

  const coverage = inkCoverage(cropField(ctx.page, boxes[0].box, padding).image);
  const reading: Reading = { kind: 'ink', coverage: round3(coverage) };
  return { reading, interpretation: type.interpret(reading, options, ctx.typeContext), details: { coverage: reading.coverage } };
}

/** The blank under a part, where the schema names a blank and the part has an aligned region. */
function blankPart(ctx: ReadFieldContext, part: LocatedPart): BlankPart | undefined {
  return ctx.reference && part.region && part.expected ? { reference: ctx.reference, region: part.region, onPage: part.expected } : undefined;
}

