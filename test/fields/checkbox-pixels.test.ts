import { describe, expect, it } from 'vitest';
import { renderCheckbox, MARK_KINDS, isChecked, type MarkKind } from '../../src/synth/checkbox-mark.js';
import { drawScanParams } from '../../src/synth/scan-params.js';
import { simulateScan } from '../../src/synth/scan-simulate.js';
import { REFERENCE_DPI } from '../../src/synth/layout-model.js';
import { composeH, rotateH, translateH } from '../../src/synth/homography.js';
import { Rng } from '../../src/synth/prng.js';
import type { GrayImage } from '../../src/image/raster.js';
import { measureMark } from '../../src/read/marks.js';
import { getFieldType } from '../../src/fields/registry.js';
import { DEFAULT_CHECKED_ABOVE, DEFAULT_UNCHECKED_BELOW } from '../../src/fields/mark-decision.js';
import { TODAY } from './context.js';

/**
 * A box crop as a poor office scan would give it: the heavy scan simulation of src/synth (blur, noise, specks,
 * uneven light, JPEG), with a small rotation about the crop centre instead of the page shift (a crop is cut around
 * the detected box, so the box stays in it).
 */
async function scannedBox(size: number, shape: 'square' | 'round', mark: MarkKind, seed: number): Promise<GrayImage> {
  const { image } = await renderCheckbox({ size, shape, mark, seed });
  const rng = new Rng(seed * 7 + size);
  const p = drawScanParams(rng, image.width, image.height, { level: 'heavy', dpi: REFERENCE_DPI, upsideDownRate: 0 });
  const c = image.width / 2;
  p.transform = composeH(translateH(-c, -c), rotateH(p.skew), translateH(c, c));
  return simulateScan(image, p, rng);
}

function interpretCheckbox(fillRatio: number, boxFound = true) {
  const t = getFieldType('checkbox');
  return t.interpret({ kind: 'marks', marks: [{ key: 'x', fillRatio, boxFound }] }, t.options.parse({}), { today: TODAY });
}

describe('checkbox fill ratio on rendered boxes', () => {
  it('finds the printed square or circle and measures inside it', async () => {
    for (const shape of ['square', 'round'] as const) {
      const { image, box } = await renderCheckbox({ size: 30, shape, mark: 'empty', seed: 900001 });
      const m = measureMark(image);
      expect(m.boxFound).toBe(true);
      // The outline found is the printed one, to a pixel of anti-aliasing.
      expect(Math.abs(m.box!.x - box.x)).toBeLessThanOrEqual(1);
      expect(Math.abs(m.box!.w - box.w)).toBeLessThanOrEqual(2);
      // The measured inside excludes the border: an empty box reads zero ink.
      expect(m.fillRatio).toBe(0);
    }
  });

  it.each([
    ['empty', false],
    ['dot', false],
    ['tick', true],
    ['cross', true],
    ['fill', true],
    ['light', true],
  ] as [MarkKind, boolean][])('clean render, %s → checked=%s', async (mark, checked) => {
    // Known ink: the synth helper's own drawing of each mark; a stray dot is an unchecked box (common practice).
    expect(isChecked(mark) && mark !== 'dot').toBe(checked);
    for (const size of [26, 34, 42])
      for (const shape of ['square', 'round'] as const) {
        const { image } = await renderCheckbox({ size, shape, mark, seed: 900000 + size });
        const r = interpretCheckbox(measureMark(image).fillRatio);
        expect(r.outcome, `${shape} ${size}`).toBe('valid');
        expect(r.value, `${shape} ${size}`).toBe(checked);
      }
  });

  it('separates the mark kinds on simulated poor scans with the default thresholds', async () => {
    // The measurement behind DEFAULT_CHECKED_ABOVE / DEFAULT_UNCHECKED_BELOW: 2 shapes x 4 sizes x 8 seeds per kind.
    const fills: Record<string, number[]> = {};
    let wrong = 0;
    let ambiguous = 0;
    let total = 0;
    for (const mark of MARK_KINDS)
      for (const shape of ['square', 'round'] as const)
        for (const size of [22, 28, 34, 42])
          for (let seed = 900000; seed < 900008; seed++) {
            const m = measureMark(await scannedBox(size, shape, mark, seed));
            expect(m.boxFound).toBe(true);
            (fills[mark] ??= []).push(m.fillRatio);
            const r = interpretCheckbox(m.fillRatio);
            total++;
            if (r.outcome === 'ambiguous') ambiguous++;
            else if (r.value !== (mark !== 'dot' && isChecked(mark))) wrong++;
          }
    const row = (k: string) => {
      const v = fills[k].slice().sort((a, b) => a - b);
      return `${k}: min ${v[0].toFixed(3)} median ${v[v.length >> 1].toFixed(3)} max ${v[v.length - 1].toFixed(3)}`;
    };
    console.log(`fill ratios on heavy scans (thresholds ${DEFAULT_UNCHECKED_BELOW} / ${DEFAULT_CHECKED_ABOVE}):\n  ` + MARK_KINDS.map(row).join('\n  ') + `\n  wrong ${wrong}/${total}, ambiguous ${ambiguous}/${total}`);
    const max = (k: string) => Math.max(...fills[k]);
    const min = (k: string) => Math.min(...fills[k]);
    // Empty boxes never reach the ambiguous band; ink ticks and crosses always clear the checked threshold.
    expect(max('empty')).toBeLessThan(DEFAULT_UNCHECKED_BELOW);
    expect(min('tick')).toBeGreaterThan(DEFAULT_CHECKED_ABOVE);
    expect(min('cross')).toBeGreaterThan(DEFAULT_CHECKED_ABOVE);
    expect(min('fill')).toBeGreaterThan(DEFAULT_CHECKED_ABOVE);
    // Faint pencil ticks and stray dots overlap a little: at most 3 % silently wrong, the rest goes right or to review.
    expect(wrong / total).toBeLessThan(0.03);
  });

  it('sends a fill between the thresholds to review with ambiguous_mark, and a box without outline with a reason', () => {
    const mid = interpretCheckbox((DEFAULT_CHECKED_ABOVE + DEFAULT_UNCHECKED_BELOW) / 2);
    expect(mid.outcome).toBe('ambiguous');
    expect(mid.reasons).toEqual(['ambiguous_mark']);
    const noBox = interpretCheckbox(0.4, false);
    expect(noBox.value).toBe(true);
    expect(noBox.reasons).toContain('box_not_found');
    expect(noBox.confidence).toBeLessThan(interpretCheckbox(0.4, true).confidence);
  });

  it('reads a blank crop without any printed box as unchecked, outline not found', () => {
    const blank: GrayImage = { width: 40, height: 40, data: new Uint8Array(1600).fill(250) };
    const m = measureMark(blank);
    expect(m).toMatchObject({ fillRatio: 0, boxFound: false });
  });
});

describe('choice group on rendered boxes', () => {
  const options = {
    multiple: false,
    choices: [
      { value: 'dog', region: [100, 100, 30, 30] },
      { value: 'cat', region: [200, 100, 30, 30] },
      { value: 'rabbit', region: [300, 100, 30, 30] },
    ],
  };

  async function readGroup(marks: MarkKind[], multiple = false) {
    const t = getFieldType('choice');
    const o = t.options.parse({ ...options, multiple });
    const parts = t.parts!(o, 'species');
    const read = await Promise.all(
      parts.map(async (p, i) => {
        const m = measureMark((await renderCheckbox({ size: 30, shape: 'round', mark: marks[i], seed: 900100 + i })).image);
        return { key: p.key, fillRatio: m.fillRatio, boxFound: m.boxFound };
      }),
    );
    return t.interpret({ kind: 'marks', marks: read }, o, { today: TODAY });
  }

  it('returns one part per choice with its region', () => {
    const t = getFieldType('choice');
    expect(t.parts!(t.options.parse(options), 'species')).toEqual(options.choices.map((c) => ({ key: c.value, region: c.region })));
  });

  it('reads the single ticked choice', async () => {
    expect((await readGroup(['empty', 'tick', 'empty'])).value).toBe('cat');
  });

  it('sends none or two ticked in a single-choice group to review', async () => {
    const none = await readGroup(['empty', 'empty', 'dot']);
    expect(none.outcome).toBe('ambiguous');
    expect(none.reasons).toContain('no_choice_marked');
    const two = await readGroup(['cross', 'tick', 'empty']);
    expect(two.outcome).toBe('ambiguous');
    expect(two.reasons).toContain('several_choices_marked');
  });

  it('lists every ticked choice of a multiple-choice group, in schema order', async () => {
    expect((await readGroup(['cross', 'empty', 'fill'], true)).value).toEqual(['dog', 'rabbit']);
    const none = await readGroup(['empty', 'empty', 'empty'], true);
    expect(none).toMatchObject({ value: [], outcome: 'empty' });
  });
});
