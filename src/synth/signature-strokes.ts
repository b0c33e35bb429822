import type { Box } from '../image/geometry.js';
import type { Rng } from './prng.js';
import { gray, n, smoothPath } from '../image/svg.js';

/**
 * A made-up signature: a few connected loops moving left to right with a rising first stroke and an optional
 * underline flourish. Not any person's signature; it only has to look like pen ink of signature size.
 */
export function signatureSvg(area: Box, rng: Rng, ink: number): string {
  const width = area.w * rng.range(0.35, 0.7);
  const x0 = area.x + rng.range(0.03, 0.25) * area.w;
  const mid = area.y + area.h * rng.range(0.5, 0.65);
  const amp = area.h * rng.range(0.18, 0.3);
  const strokes: string[] = [];
  const pieces = rng.int(1, 3);
  let x = x0;
  for (let p = 0; p < pieces; p++) {
    const len = (width / pieces) * rng.range(0.7, 1);
    const loops = rng.int(3, 7);
    const pts: [number, number][] = [[x, mid + amp * rng.range(0.2, 0.6)]];
    pts.push([x + len * 0.05, mid - amp * rng.range(0.9, 1.4)]);
    for (let k = 1; k <= loops * 2; k++) {
      const t = k / (loops * 2);
      pts.push([x + len * t + rng.range(-4, 4), mid + (k % 2 === 0 ? -1 : 1) * amp * rng.range(0.3, 0.9)]);
    }
    strokes.push(smoothPath(pts));
    x += len + rng.range(8, 24);
  }
  if (rng.chance(0.5)) {
    const y = mid + amp * rng.range(0.9, 1.3);
    strokes.push(smoothPath([[x0 - 5, y + 3], [x0 + width * 0.5, y], [x0 + width * rng.range(0.8, 1.05), y - 6]]));
  }
  const w = rng.range(2, 4);
  return strokes
    .map((d) => `<path d="${d}" fill="none" stroke="${gray(ink)}" stroke-width="${n(w)}" stroke-linecap="round" stroke-linejoin="round"/>`)
    .join('');
}
