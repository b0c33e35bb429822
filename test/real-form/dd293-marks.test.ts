import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { DD293_BLANK, extractWithShippedModel, filledBlank, schemaOnBlank } from './blank-variant.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

/**
 * DD Form 293 item 2 (component: regular, reserve, guard): three printed squares 6 px below one ruled line and 6 px
 * above the next, hand-measured on the blank. Item 16a (yes / no) sits on a shaded row. Ticks are invented.
 */
const SCHEMA = `
  - name: component
    type: choice
    class: checkbox
    required: true
    options:
      choices:
        - { value: regular, region: [337, 502, 29, 29] }
        - { value: reserve, region: [546, 502, 29, 29] }
        - { value: guard, region: [784, 502, 29, 29] }
`;

/** A heavy pen tick on the reserve box that overshoots the box and the ruled line above it. */
const HEAVY_TICK = '<path d="M 540 514 L 556 536 L 590 484" fill="none" stroke="#181818" stroke-width="6" stroke-linecap="round"/>';

async function scanned(extraSvg: string): Promise<Buffer> {
  // A light office scan: slight blur and JPEG (libvips), shifted by 3 px on the sheet.
  const png = await filledBlank([], extraSvg, DD293_BLANK);
  const blurred = await sharp(png).blur(0.8).extend({ top: 3, left: 3, background: '#ffffff' }).jpeg({ quality: 70 }).toBuffer();
  return sharp(blurred).grayscale().png().toBuffer();
}

describe('marks on the real DD Form 293, measured as ink added over the blank', () => {
  it('reads a one-of group whose boxes sit between ruled lines, with a tick that overflows its box', async () => {
    const loaded = await schemaOnBlank(SCHEMA, DD293_BLANK);
    const [ticked, blank] = await extractWithShippedModel(loaded, [await scanned(HEAVY_TICK), await scanned('')], 'dd293-marks', ocr);
    const component = ticked.fields.find((f) => f.name === 'component')!;
    expect(component.value).toBe('reserve');
    expect(component.status).toBe('accepted');
    const marks = (component.details as { marks: { key: string; fillRatio: number; method: string }[] }).marks;
    expect(marks.every((m) => m.method === 'added_ink')).toBe(true);
    // The empty boxes measure what a writer added to them: nothing (bench/real-form-marks.ts: empty boxes on the
    // development forms <= 0.06).
    for (const m of marks.filter((x) => x.key !== 'reserve')) expect(m.fillRatio).toBeLessThan(0.05);
    expect(marks.find((x) => x.key === 'reserve')!.fillRatio).toBeGreaterThan(0.15);

    const none = blank.fields.find((f) => f.name === 'component')!;
    expect(none.value).toBeNull();
    expect(none.reasons).toContain('no_choice_marked');
  }, 180_000);
});
