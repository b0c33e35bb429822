import type { Detection } from '../detect/types.js';
import type { Affine, Box } from '../page/geometry.js';
import { transformBox } from '../page/geometry.js';
import type { ExpectedPart } from './expected-boxes.js';
import { matchScore } from './match-score.js';

export interface ScaleTranslationFit {
  /** reference → page */
  transform: Affine;
  /** Mean distance in reference pixels between matched region centres and detection centres after the fit. */
  residual: number | null;
  matched: number;
}

/** Greedy one-to-one matching of expected regions (already on the page) to same-class detections by match score. */
export function greedyMatch(
  parts: readonly ExpectedPart[],
  expectedOnPage: readonly (Box | null)[],
  detections: readonly Detection[],
  minScore: number,
): Map<number, number> {
  const pairs: { p: number; d: number; s: number }[] = [];
  parts.forEach((part, p) => {
    const e = expectedOnPage[p];
    if (!e) return;
    detections.forEach((det, d) => {
      if (det.className !== part.className) return;
      const s = matchScore(e, det.box);
      if (s >= minScore) pairs.push({ p, d, s });
    });
  });
  pairs.sort((a, b) => b.s - a.s || a.p - b.p || a.d - b.d);
  const byPart = new Map<number, number>();
  const usedDet = new Set<number>();
  for (const { p, d } of pairs) {
    if (byPart.has(p) || usedDet.has(d)) continue;
    byPart.set(p, d);
    usedDet.add(d);
  }
  return byPart;
}

/** Least-squares scale and translation per axis from box edges: page = s * ref + t. */
function solveAxis(ref: number[], page: number[]): { s: number; t: number } | null {
  const n = ref.length;
  if (n < 2) return null;
  const mr = ref.reduce((a, b) => a + b, 0) / n;
  const mp = page.reduce((a, b) => a + b, 0) / n;
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    num += (ref[i] - mr) * (page[i] - mp);
    den += (ref[i] - mr) ** 2;
  }
  if (den < 1e-6) return null;
  const s = num / den;
  return { s, t: mp - s * mr };
}

/**
 * Fit scale and translation of the reference layout to the detections, starting from the plain page-size ratio and
 * re-matching twice: enough when a scan is only shifted and scaled (rotation is removed before this by deskew).
 */
export function fitScaleTranslation(
  parts: readonly ExpectedPart[],
  detections: readonly Detection[],
  initial: Affine,
): ScaleTranslationFit {
  let transform = initial;
  let matched = 0;
  let residual: number | null = null;
  for (let round = 0; round < 3; round++) {
    const onPage = parts.map((p) => (p.region ? transformBox(transform, p.region) : null));
    const matches = greedyMatch(parts, onPage, detections, round === 0 ? 0.1 : 0.3);
    const rx: number[] = [];
    const px: number[] = [];
    const ry: number[] = [];
    const py: number[] = [];
    for (const [p, d] of matches) {
      const r = parts[p].region as Box;
      const b = detections[d].box;
      rx.push(r.x, r.x + r.w);
      px.push(b.x, b.x + b.w);
      ry.push(r.y, r.y + r.h);
      py.push(b.y, b.y + b.h);
    }
    const fx = solveAxis(rx, px);
    const fy = solveAxis(ry, py);
    matched = matches.size;
    if (!fx || !fy || matches.size < 3 || fx.s <= 0 || fy.s <= 0) break;
    transform = { a: fx.s, b: 0, c: fx.t, d: 0, e: fy.s, f: fy.t };
    let sum = 0;
    for (const [p, d] of matches) {
      const r = parts[p].region as Box;
      const b = detections[d].box;
      const cx = fx.s * (r.x + r.w / 2) + fx.t - (b.x + b.w / 2);
      const cy = fy.s * (r.y + r.h / 2) + fy.t - (b.y + b.h / 2);
      sum += Math.hypot(cx / fx.s, cy / fy.s);
    }
    residual = sum / matches.size;
  }
  return { transform, residual, matched };
}
