import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { thresholdAt } from '../../src/image/binary.js';
import { labelComponents } from '../../src/image/components.js';
import { iou } from '../../src/image/geometry.js';
import { inkThreshold } from '../../src/image/ink.js';
import { cropGray, grayFromImage } from '../../src/image/raster.js';
import { enclosedShare, hasRule, hasWritingSpace, printedMark } from '../../src/draft/printed-mark.js';
import { W4_BLANK } from '../real-form/w4-layout.js';

// Real blanks (public domain, test/fixtures/real-forms/README.md): DD Form 293 page 1 and IRS Form W-4 (2025)
// page 1, both rendered at 200 dpi.
const DD293 = path.join('test', 'fixtures', 'real-forms', 'dod-dd293-2023-page1-blank.png');

describe('printedMark: a checkbox on a blank needs a printed square or circle (real pixels)', () => {
  it('finds the printed square under the widget rectangles of the DD 293, labels touching the box included', async () => {
    const page = await grayFromImage(DD293);
    const t = inkThreshold(page);
    // Widget rectangles of dod-dd293-2023.pdf page 1 (/Rect of the check box widgets, read with pdf-lib and turned
    // into 200-dpi pixels by src/draft/from-pdf/assemble.ts rectToBox): the outside source of where the boxes are.
    const widgets = [
      { x: 632, y: 462, w: 29, h: 29 }, // Army
      { x: 361, y: 1284, w: 29, h: 29 }, // Character of service: its label starts 2 px right of the box
      { x: 685, y: 1284, w: 29, h: 29 }, // Separation code: likewise
      { x: 458, y: 1807, w: 29, h: 29 }, // Operation Iraqi Freedom: two-line label touching the box
      { x: 1134, y: 1535, w: 28, h: 29 }, // Yes
    ];
    for (const w of widgets) {
      const frame = printedMark(page, w, t);
      expect(frame, JSON.stringify(w)).not.toBeNull();
      expect(iou(frame!, w)).toBeGreaterThan(0.8);
      // A thin-ruled square encloses most of its box (geometry: side s, stroke 0.05 s -> 0.81).
      expect(enclosedShare(page, frame!, t)).toBeGreaterThan(0.7);
    }
  });

  it('refuses every letter of a printed label (C, O, R and the rest), wherever the detector puts a box on it', async () => {
    const page = await grayFromImage(DD293);
    const t = inkThreshold(page);
    // The label "CHARACTER OF SERVICE" right of its box at (361, 1284) on the DD 293 (located by eye on the blank).
    const region = { x: 394, y: 1280, w: 270, h: 36 };
    const { components } = labelComponents(thresholdAt(cropGray(page, region), t));
    const letters = components.filter((c) => c.box.h >= 12 && !c.touchesBorder);
    // 18 letters in "CHARACTER OF SERVICE".
    expect(letters.length).toBeGreaterThanOrEqual(15);
    for (const c of letters) {
      // A detection box sitting on the letter, a little loose as the detector's are.
      const box = { x: region.x + c.box.x - 2, y: region.y + c.box.y - 2, w: c.box.w + 4, h: c.box.h + 4 };
      expect(printedMark(page, box, t), JSON.stringify(box)).toBeNull();
    }
  });
});

describe('hasRule: an entry area on a blank stands on a printed rule (real pixels)', () => {
  it('finds the cell rules of the W-4 and none under a paragraph of its instructions', async () => {
    const page = await grayFromImage(W4_BLANK);
    const t = inkThreshold(page);
    // Hand-labelled cells of test/fixtures/real-forms/w4-page1.yaml (measured from the blank's ruled lines).
    expect(hasRule(page, { x: 261, y: 235, w: 497, h: 63 }, t)).toBe(true); // First name and middle initial
    expect(hasRule(page, { x: 261, y: 367, w: 1057, h: 65 }, t)).toBe(true); // City or town, state, and ZIP code
    // Lines of the "TIP:" paragraph under Step 1 (located by eye): print, but no rule to write on.
    expect(hasRule(page, { x: 300, y: 604, w: 700, h: 34 }, t)).toBe(false);
    expect(hasRule(page, { x: 120, y: 640, w: 900, h: 60 }, t)).toBe(false);
  });
});

describe('hasWritingSpace: a text entry on a blank leaves room to write (real pixels)', () => {
  it('keeps the W-4 cells with a caption in the corner and drops the step heading printed in its own column', async () => {
    const page = await grayFromImage(W4_BLANK);
    const t = inkThreshold(page);
    // Hand-labelled cells of test/fixtures/real-forms/w4-page1.yaml: caption at the top, writing space below it.
    expect(hasWritingSpace(page, { x: 261, y: 235, w: 497, h: 63 }, t)).toBe(true);
    expect(hasWritingSpace(page, { x: 261, y: 301, w: 1057, h: 65 }, t)).toBe(true);
    // "Step 1: Enter Personal Information", printed in the left column beside those cells (located by eye): ruled
    // like a cell but filled with its heading.
    expect(hasWritingSpace(page, { x: 95, y: 235, w: 160, h: 135 }, t)).toBe(false);
  });
});
