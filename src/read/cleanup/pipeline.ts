import type { Box } from '../../image/geometry.js';
import type { GrayImage } from '../../image/raster.js';
import { createGray } from '../../image/raster.js';
import { binarizeOtsu } from '../../image/otsu.js';
import { binarizeSauvola } from '../../image/sauvola.js';
import { estimateCropSkew, rotateCrop, uprightBox } from './deskew.js';
import { horizontalRuleLength, removeDashedRules, removeRuledLines } from './line-removal.js';
import { removePrintedRules } from './printed-rules.js';
import { filterComponents, labelComponents } from '../../image/components.js';
import { dropStrayEnds, inkBounds, isolateTextBand } from './text-band.js';
import { resizeBilinear, upscaleToCharacterHeight } from './upscale.js';
import { padImage, trimAndPad } from './pad.js';
import { INK, PAPER, thresholdAt } from '../../image/binary.js';
import { compactGapsAlong } from './compact.js';
import { characterHeight } from './upscale.js';

/** The cleanup steps, in the order they run when a variant lists them. */
export const CLEANUP_STEPS = ['deskew', 'otsu', 'sauvola', 'lines', 'components', 'band', 'compact', 'upscale', 'pad', 'regray'] as const;
export type CleanupStep = (typeof CLEANUP_STEPS)[number];

/** A named recipe of steps; `readTextField` tries variants in turn. */
export interface CleanupVariant {
  name: string;
  steps: readonly CleanupStep[];
  /** Comb fields: read each printed cell as one character instead of the whole line (see read-text.ts). */
  perCell?: boolean;
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
  /**
   * Where the blank form has print under the crop (0) and paper (255), when the schema names a blank: the lines
   * step then removes only rules printed on the blank, and pen strokes as tall or long as the cell survive.
   */
  printed?: GrayImage;
}

/**
 * Between steps: `image` is what the next step works on (grayscale until a binarization, then the binary ink mask);
 * `gray` is the grayscale crop moved along through every geometric change (rotation, compaction, scaling, trimming)
 * so the last step can hand tesseract the original gray levels of the kept ink.
 */
interface State {
  image: GrayImage;
  gray: GrayImage;
  binary: boolean;
  inner: Box;
  /** ctx.printed, moved along through rotation. */
  printed?: GrayImage;
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
export function ruleLengths(ctx: Pick<CleanupContext, 'comb'>, inner: Box): { minVertical: number; minAnchoredVertical?: number } {
  const minVertical = Math.max(12, Math.round(inner.h * 0.8));
  return ctx.comb ? { minVertical, minAnchoredVertical: Math.max(5, Math.round(inner.h * 0.25)) } : { minVertical };
}

function runStep(step: CleanupStep, s: State, ctx: CleanupContext): State {
  switch (step) {
    case 'deskew': {
      const angle = ctx.skew ?? estimateCropSkew(s.binary ? s.image : binarizeOtsu(s.image));
      if (Math.abs(angle) < 0.2) return s;
      const gray = rotateCrop(s.gray, angle);
      const inner = uprightBox(s.inner, angle, s.image.width, s.image.height);
      const printed = s.printed && invertedThreshold(rotateCrop(s.printed, angle));
      return { ...s, gray, image: s.binary ? thresholdAt(rotateCrop(s.image, angle), 127) : gray, inner, printed };
    }
    case 'otsu':
      return { ...s, image: binarizeOtsu(s.gray), binary: true };
    case 'sauvola':
      return { ...s, image: binarizeSauvola(s.gray, { window: Math.max(15, Math.round(s.inner.h) | 1) }), binary: true };
    case 'lines': {
      const b = ensureBinary(s);
      const removed = removeDashedRules(removeRuledLines(b.image, ruleLengths(ctx, b.inner)).image);
      if (!b.printed) return { ...b, image: removed };
      const ruleLength = horizontalRuleLength(b.image.width);
      const kept = keepUnprinted(b.image, removed, b.printed, ruleLength);
      // A printed upright as short as 15 % of the field's height counts: comb ticks rise that little from their rule
      // (fec-f99's street line; cell sides are far taller). Chosen on the development half of the real-form bench.
      const minUpright = Math.max(4, Math.round(b.inner.h * 0.15));
      return { ...b, image: removePrintedRules(kept, b.printed, { minRule: ruleLength, minUpright }) };
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
      if (height === null) return b;
      const [image, gray] = compactGapsAlong(b.image, height, [b.gray]);
      return { ...b, image, gray };
    }
    case 'upscale': {
      const b = ensureBinary(s);
      const { image, factor } = upscaleToCharacterHeight(b.image, { target: ctx.characterHeight });
      if (factor === 1) return b;
      const inner = { x: b.inner.x * factor, y: b.inner.y * factor, w: b.inner.w * factor, h: b.inner.h * factor };
      return { ...b, image, gray: resizeTo(b.gray, image), inner };
    }
    case 'pad': {
      if (!s.binary) {
        const gray = padImage(s.gray, 10);
        return { ...s, image: gray, gray };
      }
      const ink = inkBounds(s.image);
      return { ...s, image: trimAndPad(s.image, ink), gray: trimAndPad(s.gray, ink) };
    }
    case 'regray':
      return s.binary ? { ...s, image: maskedGray(s.gray, s.image), binary: false } : s;
  }
}

/**
 * Rule removal limited to the blank's print: ink the removal took where the blank has no print is a pen stroke (the
 * stem of an l, t or k, a descender) and goes back. In tight ruled cells those strokes
 * are as tall as the cell and were erased as rules ("Stillwater" read "S-i.waer").
 *
 * Except pieces as wide as a ruled line (the length the lines step itself takes a horizontal run for a rule at): a frame
 * drawn around the field that the blank lacks (the border and comb dividers a PDF viewer draws for a filled widget, a
 * box the writer ruled), or a printed rule that lies further from its place on the blank than the tolerance. Stems
 * and descenders are narrow; a pen stroke that long is an underline or a strike-through, not part of the value.
 * Restoring them read "D" boxed as "0", empty boxed combs as letters (va-21-0966, typed fill) and added "ee ———" to
 * small typed text sitting on its field's rule (nara-sf180).
 */
function keepUnprinted(before: GrayImage, after: GrayImage, printed: GrayImage, ruleLength: number): GrayImage {
  const taken = createGray(after.width, after.height, PAPER);
  for (let i = 0; i < taken.data.length; i++) {
    if (before.data[i] === INK && after.data[i] !== INK && printed.data[i] !== 0) taken.data[i] = INK;
  }
  const { labels, components } = labelComponents(taken);
  const rule = new Uint8Array(components.length + 1);
  for (const c of components) if (c.box.w >= ruleLength) rule[c.id] = 1;
  const data = Uint8Array.from(after.data);
  for (let i = 0; i < data.length; i++) if (labels[i] !== 0 && !rule[labels[i]]) data[i] = INK;
  return { width: after.width, height: after.height, data };
}


/** A rotated 0/255 mask back to exactly 0 and 255 (rotation blends its edges). */
function invertedThreshold(img: GrayImage): GrayImage {
  const data = new Uint8Array(img.data.length);
  for (let i = 0; i < data.length; i++) data[i] = img.data[i] < 128 ? 0 : 255;
  return { width: img.width, height: img.height, data };
}

/** Resample `img` to exactly the size of `like` (factor rounding can differ by a pixel). */
function resizeTo(img: GrayImage, like: GrayImage): GrayImage {
  const r = resizeBilinear(img, like.width / img.width);
  if (r.width === like.width && r.height === like.height) return r;
  const out = createGray(like.width, like.height);
  for (let y = 0; y < like.height; y++)
    for (let x = 0; x < like.width; x++)
      out.data[y * like.width + x] = r.data[Math.min(r.height - 1, y) * r.width + Math.min(r.width - 1, x)];
  return out;
}

/**
 * The grayscale crop seen only through the kept ink (grown by one pixel so anti-aliased glyph edges stay):
 * everything the cleanup removed is paper, the glyphs keep their original gray levels and tesseract binarizes
 * them itself.
 */
export function maskedGray(gray: GrayImage, mask: GrayImage): GrayImage {
  const { width: w, height: h } = mask;
  const out = createGray(w, h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let near = false;
      for (let dy = -1; dy <= 1 && !near; dy++) {
        const yy = y + dy;
        if (yy < 0 || yy >= h) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const xx = x + dx;
          if (xx >= 0 && xx < w && mask.data[yy * w + xx] === 0) { near = true; break; }
        }
      }
      if (near) out.data[y * w + x] = gray.data[y * w + x];
    }
  }
  return out;
}

/** Run a variant's steps over a field crop; returns the image to hand to OCR (blank paper when no ink is left). */
export function cleanCrop(image: GrayImage, variant: CleanupVariant, ctx: CleanupContext): GrayImage {
  let s: State = { image, gray: image, binary: false, inner: ctx.inner, printed: ctx.printed };
  for (const step of variant.steps) s = runStep(step, s, ctx);
  return s.image;
}

/** True when a cleaned crop holds nothing but white paper (cleanup removed everything; nothing for OCR to read). */
export function isBlank(image: GrayImage): boolean {
  for (let i = 0; i < image.data.length; i++) if (image.data[i] !== 255) return false;
  return true;
}
