import type { Interpretation, OcrMode, TextReading } from '../fields/types.js';
import type { ReasonCode } from '../fields/reasons.js';
import type { Box } from '../image/geometry.js';
import type { GrayImage } from '../image/raster.js';
import type { BlankPart } from '../read/blank-crop.js';
import type { Padding } from '../read/crop.js';
import type { OcrEngine } from '../read/ocr-engine.js';
import { readTextField } from '../read/read-text.js';
import type { CleanupVariant } from '../read/cleanup/pipeline.js';
import { ADAPTIVE, STANDARD } from '../read/variants.js';
import { decideScripts } from '../fields/script.js';
import { readDigitGlyphs } from '../read/digit-glyphs.js';
import type { DigitReader } from '../read/digit-reader.js';
import type { FieldReadOutcome } from './read-field.js';

/** Reason code: a handwritten value with digits that a second reader read differently. */
export const SECOND_READ_DISAGREES: ReasonCode = 'ambiguous_second_read';

/**
 * The second read's cleanup: a different binarization from the one that gave the kept value (Sauvola's local
 * threshold against Otsu's global one, bench/cleanup-gain.ts measured them as the two strongest recipes that miss
 * different fields), so one crop's binarization accident is not read twice.
 */
export function secondVariant(kept: string | undefined): CleanupVariant {
  return kept === ADAPTIVE.name ? STANDARD : ADAPTIVE;
}

export interface SecondRead {
  agree: boolean;
  variant: string;
}

/**
 * Read the field again from a differently cleaned crop and say whether its value is the same (pure but for the OCR
 * call). Agreement needs a valid value equal to the kept one; a second read that fails the type's checks or reads
 * nothing does not confirm it.
 */
export async function secondRead(
  page: GrayImage,
  box: Box,
  kept: { reading: TextReading; interpretation: Interpretation },
  read: { engine: OcrEngine; padding: Padding; mode: OcrMode; allowed?: string; comb: boolean; blank?: BlankPart },
  interpret: (r: TextReading) => Interpretation,
): Promise<SecondRead> {
  const variant = secondVariant(kept.reading.variant);
  const again = await readTextField(page, box, { ...read, skew: 0, variants: [variant] });
  const second = interpret(again.reading);
  const agree = second.outcome === 'valid' && JSON.stringify(second.value) === JSON.stringify(kept.interpretation.value);
  return { agree, variant: variant.name };
}

/** The digits of a text, in order. */
const digitsOf = (text: string) => text.replace(/[^0-9]/g, '');

/**
 * The second read by another reader: the digit reader, glyph by glyph (src/read/digit-glyphs.ts). Tesseract reading
 * a crop twice repeats its own confusions (on the demo's handwritten slip both binarizations read 2.8 as 2.5 and
 * 93841 as 73891); a network trained on handwritten digits errs elsewhere. Agreement: the same digits in the same
 * order as the kept reading's text.
 */
export async function glyphSecondRead(crop: GrayImage, kept: { reading: TextReading }, reader: DigitReader): Promise<SecondRead> {
  const glyphRead = await readDigitGlyphs(crop, reader);
  const want = digitsOf(kept.reading.text);
  return { agree: glyphRead !== null && want.length > 0 && glyphRead.digits === want, variant: 'digit_glyphs' };
}

/** The kept interpretation, sent to review with the reason when the second read disagrees. */
export function withSecondRead(interpretation: Interpretation, check: SecondRead): Interpretation {
  if (check.agree) return interpretation;
  return { ...interpretation, outcome: 'ambiguous', reasons: [...interpretation.reasons, SECOND_READ_DISAGREES] };
}

/**
 * Once a form is read: decide each OCR entry's script with the form's other entries as evidence (src/fields/script.ts),
 * then give every handwritten value with digits its second read, sending it to review where the two disagree.
 */
export async function settleScripts(outcomes: readonly FieldReadOutcome[]): Promise<void> {
  const decisions = decideScripts(outcomes.map((o) => o.scriptEntry ?? null));
  for (const [i, o] of outcomes.entries()) {
    o.script = decisions[i];
    if (o.script?.script !== 'handwritten' || !o.recheck || o.interpretation?.outcome !== 'valid') continue;
    const check = await o.recheck();
    o.interpretation = withSecondRead(o.interpretation, check);
    o.details.secondRead = check;
  }
}
