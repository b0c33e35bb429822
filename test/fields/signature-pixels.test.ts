import { describe, expect, it } from 'vitest';
import { signatureSvg } from '../../src/synth/signature-strokes.js';
import { gray, svgDocument } from '../../src/image/svg.js';
import { rasterizeSvg } from '../../src/synth/rasterize.js';
import { drawScanParams } from '../../src/synth/scan-params.js';
import { simulateScan } from '../../src/synth/scan-simulate.js';
import { REFERENCE_DPI } from '../../src/synth/layout-model.js';
import { composeH, rotateH, translateH } from '../../src/synth/homography.js';
import { Rng } from '../../src/synth/prng.js';
import { inkCoverage } from '../../src/read/marks.js';
import { getFieldType } from '../../src/fields/registry.js';
import { DEFAULT_PRESENT_ABOVE } from '../../src/fields/signature.js';
import { TODAY } from './context.js';

const W = 360;
const H = 90;

/**
 * A signature area as forms print it: a rule to sign on, the printed label under it, and (when signed) pen strokes
 * from the synth helper's signature drawing; then a poor scan (blur, noise, JPEG, up to 3° of rotation).
 */
async function signatureArea(seed: number, signed: boolean) {
  const rng = new Rng(seed);
  const rule = `<line x1="10" y1="70" x2="350" y2="70" stroke="black" stroke-width="2"/>`;
  const label = `<text x="12" y="84" font-family="DejaVu Sans" font-size="11" fill="${gray(0)}">Signature of applicant</text>`;
  const pen = signed ? signatureSvg({ x: 10, y: 5, w: 340, h: 62 }, rng, rng.range(0, 60)) : '';
  const img = await rasterizeSvg(svgDocument(W, H, rule + label + pen));
  const p = drawScanParams(rng, W, H, { level: 'heavy', dpi: REFERENCE_DPI, upsideDownRate: 0 });
  p.transform = composeH(translateH(-W / 2, -H / 2), rotateH(p.skew), translateH(W / 2, H / 2));
  return simulateScan(img, p, rng);
}

describe('signature ink coverage on rendered areas', () => {
  it('tells signed from blank areas (rule and printed label ignored) with the default threshold', async () => {
    const blank: number[] = [];
    const signed: number[] = [];
    for (let seed = 900000; seed < 900012; seed++) {
      blank.push(inkCoverage(await signatureArea(seed, false)));
      signed.push(inkCoverage(await signatureArea(seed, true)));
    }
    console.log(`signature coverage: blank max ${Math.max(...blank).toFixed(4)}, signed min ${Math.min(...signed).toFixed(4)} (threshold ${DEFAULT_PRESENT_ABOVE})`);
    expect(Math.max(...blank)).toBeLessThan(DEFAULT_PRESENT_ABOVE);
    expect(Math.min(...signed)).toBeGreaterThan(DEFAULT_PRESENT_ABOVE * 2);
    const t = getFieldType('signature');
    const o = t.options.parse({});
    for (const c of signed) expect(t.interpret({ kind: 'ink', coverage: c }, o, { today: TODAY })).toMatchObject({ value: true, outcome: 'valid' });
    for (const c of blank) expect(t.interpret({ kind: 'ink', coverage: c }, o, { today: TODAY }).value).toBe(false);
  });

  it('sends a faint signature near the threshold to review by lower confidence', () => {
    const t = getFieldType('signature');
    const o = t.options.parse({ presentAbove: 0.02 });
    const near = t.interpret({ kind: 'ink', coverage: 0.021 }, o, { today: TODAY });
    expect(near.value).toBe(true);
    expect(near.confidence).toBeLessThan(0.75);
    expect(near.reasons).toContain('faint_signature');
  });
});
