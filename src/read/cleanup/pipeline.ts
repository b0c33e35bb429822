import type { Box } from '../../page/geometry.js';
import type { GrayImage } from '../../page/raster.js';
import { binarizeOtsu } from './otsu.js';
import { binarizeSauvola } from './sauvola.js';
import { estimateSkew, rotateGray } from './deskew.js';
import { removeDashedRules, removeRuledLines } from './line-removal.js';
import { filterComponents } from './components.js';
import { dropStrayEnds, inkBounds, isolateTextBand } from './text-band.js';
import { upscaleToCharacterHeight } from './upscale.js';
import { padImage, trimAndPad } from './pad.js';
import { thresholdAt } from './binary.js';
import { compactGaps } from './compact.js';
import { characterHeight } from './upscale.js';

/** The cleanup steps, in the order they run when a variant lists them. */
export const CLEANUP_STEPS = ['deskew', 'otsu', 'sauvola', 'lines', 'components', 'band', 'compact', 'upscale', 'pad'] as const;
export type CleanupStep = (typeof CLEANUP_STEPS)[number];

/** A named recipe of steps; `readTextField` tries variants in turn. */
export interface CleanupVariant {
  name: string;
  steps: readonly CleanupStep[];
}

export interface CleanupContext {
  /** The field box in crop pixels (from cropField's `inner`). */
  inner: Box;
  /** 'block' keeps every text line inside the box; the other modes keep the one line holding the value. */
  mode: 'line' | 'block' | 'word' | 'char';
  /** The field is a comb (one printed cell per character): separators are removed as vertical rules. */
  comb?: boolean;
  /** Known skew of the page in degrees (positive = lines fall to the right); estimated from the crop when absent. */
  skew?: number;
  /** Character height to scale to (upscale step), pixels. */
  characterHeight?: number;
}

interface State {
  image: GrayImage;
  binary: boolean;
  inner: Box;
}

function ensureBinary(s: State): State {
  return s.binary ? s : { ...s, image: binarizeOtsu(s.image), binary: true };
}

/**
 * Rules: a vertical run counts as a cell border when it spans 80 % of the field box's height (characters are shorter
 * than their cell). Comb separators are ticks that may rise only part of the cell from its bottom line, so for comb
 * fields a vertical run down to 25 % of the box height counts too when it ends on a horizontal rule. Shares are
 * common practice for printed cells, checked on bench/cleanup-gain.ts.
 */
function ruleLengths(ctx: CleanupContext, inner: Box): { minVertical: number; minAnchoredVertical?: number } {
  const minVertical = Math.max(12, Math.round(inner.h * 0.8));
  return ctx.comb ? { minVertical, minAnchoredVertical: Math.max(5, Math.round(inner.h * 0.25)) } : { minVertical };
}

function runStep(step: CleanupStep, s: State, ctx: CleanupContext): State {
  switch (step) {
    case 'deskew': {
      const angle = ctx.skew ?? estimateSkew(s.binary ? s.image : binarizeOtsu(s.image));
      if (Math.abs(angle) < 0.2) return s;
      const rotated = rotateGray(s.image, angle);
      return { ...s, image: s.binary ? thresholdAt(rotated, 127) : rotated };
    }
    case 'otsu':
      return { ...s, image: binarizeOtsu(s.image), binary: true };
    case 'sauvola':
      return { ...s, image: binarizeSauvola(s.image, { window: Math.max(15, Math.round(s.inner.h) | 1) }), binary: true };
    case 'lines': {
      const b = ensureBinary(s);
      return { ...b, image: removeDashedRules(removeRuledLines(b.image, ruleLengths(ctx, b.inner)).image) };
    }
    case 'components': {
      const b = ensureBinary(s);
      return { ...b, image: filterComponents(b.image, { inside: b.inner }).image };
    }
    case 'band': {
      const b = ensureBinary(s);
      const mode = ctx.mode === 'block' ? 'block' : 'line';
      // Cutting out the band can leave the piece of a box side that ran through it: filter once more.
      const band = isolateTextBand(b.image, { mode, inside: b.inner }).image;
      return { ...b, image: dropStrayEnds(filterComponents(band, { dropBorder: false }).image) };
    }
    case 'compact': {
      // Only comb writing is spread a cell apart; free text keeps its own spacing.
      if (!ctx.comb) return s;
      const b = ensureBinary(s);
      const height = characterHeight(b.image);
      return height === null ? b : { ...b, image: compactGaps(b.image, height) };
    }
    case 'upscale': {
      const b = ensureBinary(s);
      const { image, factor } = upscaleToCharacterHeight(b.image, { target: ctx.characterHeight });
      const inner = { x: b.inner.x * factor, y: b.inner.y * factor, w: b.inner.w * factor, h: b.inner.h * factor };
      return { ...b, image, inner };
    }
    case 'pad':
      return s.binary ? { ...s, image: trimAndPad(s.image, inkBounds(s.image)) } : { ...s, image: padImage(s.image, 10) };
  }
}

/** Run a variant's steps over a field crop; returns the image to hand to OCR (blank paper when no ink is left). */
export function cleanCrop(image: GrayImage, variant: CleanupVariant, ctx: CleanupContext): GrayImage {
  let s: State = { image, binary: false, inner: ctx.inner };
  for (const step of variant.steps) s = runStep(step, s, ctx);
  return s.image;
}

/** True when a cleaned crop holds no ink at all (nothing for OCR to read). */
export function isBlank(image: GrayImage): boolean {
  for (let i = 0; i < image.data.length; i++) if (image.data[i] < 128) return false;
  return true;
}
