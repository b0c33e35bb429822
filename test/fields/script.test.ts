import { afterAll, describe, expect, it } from 'vitest';
import type { FontKey } from '../../src/image/fonts.js';
import { entryBox } from './entry-box.js';
import { cropGray } from '../../src/image/raster.js';
import { readTextField } from '../../src/read/read-text.js';
import { OcrEngine } from '../../src/read/ocr-engine.js';
import { scriptMeasures } from '../../src/read/script-measures.js';
import { decideScript, decideScripts, scriptInputs, ScriptModel, SHIPPED_SCRIPT_MODEL, SCRIPT_FEATURES, type ScriptInputs } from '../../src/fields/script.js';

/**
 * The shipped print/handwriting decision on real pixels: invented entries written into a printed box with the
 * bundled fonts, measured, read by the real tesseract.js, decided. Which font is which comes from outside the
 * project: DejaVu Sans, Serif and Sans Mono are text typefaces (the DejaVu project's own description), Caveat and
 * Nanum Pen Script are in Google Fonts' "Handwriting" category (fonts.google.com classification).
 */
async function decide(text: string, font: FontKey, size: number) {
  const { page, box } = await entryBox(text, font, size, 440);
  const measures = scriptMeasures(cropGray(page, box));
  expect(measures).not.toBeNull();
  const read = await readTextField(page, box, { engine: ocr });
  return decideScript(scriptInputs(measures!, read.reading));
}

const ocr = new OcrEngine();
afterAll(() => ocr.close());

describe('print or handwriting', () => {
  it('the shipped model file is a valid model', () => {
    expect(ScriptModel.safeParse(SHIPPED_SCRIPT_MODEL).success).toBe(true);
    expect(SHIPPED_SCRIPT_MODEL.features.length).toBeGreaterThan(0);
  });

  // Sizes as the generator writes into a 48 px box (src/synth/fill.ts drawPen: typed 0.48-0.6, handwriting 0.7-0.85
  // of the box height).
  it.each([
    ['Juniper Ashgrove', 'sans' as const, 26, 'printed' as const],
    ['14 Harbour Lane', 'serif' as const, 26, 'printed' as const],
    ['2024-03-14', 'mono' as const, 26, 'printed' as const],
    ['Juniper Ashgrove', 'caveat' as const, 38, 'handwritten' as const],
    ['14 Harbour Lane', 'pen' as const, 38, 'handwritten' as const],
    ['Maple Cove', 'caveat' as const, 38, 'handwritten' as const],
  ])('"%s" in %s at %i px is %s', async (text, font, size, script) => {
    const d = await decide(text, font, size);
    expect(d.script).toBe(script);
    expect(d.handwriting >= SHIPPED_SCRIPT_MODEL.threshold).toBe(script === 'handwritten');
  });

  it("takes the form's other entries as evidence (one writer, one pen)", async () => {
    const entry = async (text: string, font: FontKey, size: number) => {
      const { page, box } = await entryBox(text, font, size, 440);
      return scriptInputs(scriptMeasures(cropGray(page, box))!, (await readTextField(page, box, { engine: ocr })).reading);
    };
    const hand = [await entry('Maple Cove', 'caveat', 38), await entry('Juniper Ashgrove', 'pen', 38), await entry('14 Harbour Lane', 'caveat', 38)];
    const typed = [await entry('Maple Cove', 'sans', 26), await entry('Juniper Ashgrove', 'serif', 26), await entry('14 Harbour Lane', 'sans', 26)];
    // An entry with nothing to tell (every measure at the model's mean) goes with the form it is on.
    const undecided = Object.fromEntries(SCRIPT_FEATURES.map((f) => [f, SHIPPED_SCRIPT_MODEL.mean[SHIPPED_SCRIPT_MODEL.features.indexOf(f)] ?? null])) as ScriptInputs;
    expect(decideScripts([...hand, undecided]).map((d) => d?.script)).toEqual(['handwritten', 'handwritten', 'handwritten', 'handwritten']);
    expect(decideScripts([...typed, undecided]).map((d) => d?.script)).toEqual(['printed', 'printed', 'printed', 'printed']);
    expect(decideScripts([null, hand[0]])[0]).toBeUndefined();
  });

  it('has nothing to measure in an empty box', async () => {
    const { page, box } = await entryBox('', 'sans', 26, 440);
    expect(scriptMeasures(cropGray(page, box))).toBeNull();
  });
});
