import type { Detection } from '../detect/types.js';
import type { Alignment, LayoutRegion } from './alignment.js';
import { alignByDetections } from './align-detections.js';
import { alignByImage } from './align-image.js';
import type { GrayImage } from '../image/raster.js';

/**
 * Which of several layouts is this page? Each candidate is aligned to the page and scored: by the correlation
 * of the page's ink with the candidate's blank reference after registration when the schema names one, else by
 * how many detections land on the candidate's regions. The best score wins; a best score under `minScore`
 * means no layout fits (reason `unknown_layout`).
 */

/**
 * Lowest image-registration score of a page against its own layout's blank. Measured on bench/page-align.ts (201
 * held-out heavy pages, three demo layouts): a page scores 0.774..0.98 (median 0.94) against its own blank, at most
 * 0.455 (median 0) against another; 0.6 sits between with room both ways. The real-form bench's pages align to
 * their blanks at 0.83 and up (bench/real-forms.ts, development half).
 */
export const LAYOUT_MIN_SCORE = 0.6;

export interface LayoutCandidate {
  name: string;
  referenceSize: { width: number; height: number };
  /** Blank reference image of the layout's page. */
  reference?: GrayImage;
  /** Regions with detector classes, reference pixels. */
  regions?: readonly LayoutRegion[];
}

export interface LayoutScore {
  name: string;
  /** 0..1; image correlation when a reference image exists, otherwise the detection/region F1. */
  score: number;
  basis: 'image' | 'detections' | 'none';
  alignment: Alignment | null;
}

export interface LayoutMatch {
  /** Name of the best-fitting layout, or null when none fits. */
  best: string | null;
  score: number;
  /** Best score minus the runner-up's (1 when there is a single candidate). */
  margin: number;
  scores: LayoutScore[];
  reason?: 'unknown_layout';
}

export interface LayoutMatchOptions {
  detections?: readonly Detection[];
  /** Lowest winning score (default LAYOUT_MIN_SCORE). */
  minScore?: number;
  /** Registration levels used for scoring (coarse is enough to tell layouts apart; default [150, 300]). */
  levels?: number[];
}

function scoreCandidate(page: GrayImage, c: LayoutCandidate, options: LayoutMatchOptions): LayoutScore {
  if (c.reference) {
    const a = alignByImage(page, c.reference, { levels: options.levels ?? [150, 300] });
    return { name: c.name, score: a.score, basis: 'image', alignment: a };
  }
  const dets = options.detections ?? [];
  if (c.regions && c.regions.length > 0 && dets.length > 0) {
    const a = alignByDetections(dets, c.regions);
    const inliers = a?.inliers ?? 0;
    return { name: c.name, score: (2 * inliers) / (dets.length + c.regions.length), basis: 'detections', alignment: a };
  }
  return { name: c.name, score: 0, basis: 'none', alignment: null };
}

/** Score every candidate layout against an upright, deskewed page and pick the best. Pure. */
export function matchLayout(page: GrayImage, candidates: readonly LayoutCandidate[], options: LayoutMatchOptions = {}): LayoutMatch {
  const scores = candidates.map((c) => scoreCandidate(page, c, options));
  const ranked = [...scores].sort((a, b) => b.score - a.score);
  const top = ranked[0];
  if (!top) return { best: null, score: 0, margin: 0, scores, reason: 'unknown_layout' };
  const margin = ranked.length > 1 ? top.score - ranked[1].score : 1;
  if (top.score < (options.minScore ?? LAYOUT_MIN_SCORE)) return { best: null, score: top.score, margin, scores, reason: 'unknown_layout' };
  return { best: top.name, score: top.score, margin, scores };
}
