import type { CleanupVariant } from './cleanup/pipeline.js';

/**
 * The cleanup recipes readTextField knows. The first is the main one; the rest are second tries when the typed
 * value fails validation. Order and contents are set by measurement (bench/cleanup-gain.ts).
 */
export const STANDARD: CleanupVariant = {
  name: 'standard',
  steps: ['deskew', 'otsu', 'lines', 'components', 'band', 'compact', 'upscale', 'pad'],
};

/** Adaptive (Sauvola) binarization for uneven lighting, otherwise as standard. */
export const ADAPTIVE: CleanupVariant = {
  name: 'adaptive',
  steps: ['deskew', 'sauvola', 'lines', 'components', 'band', 'compact', 'upscale', 'pad'],
};

/** No rule removal: for writing that runs into the rules, where removal cuts strokes. */
export const KEEP_LINES: CleanupVariant = {
  name: 'keep_lines',
  steps: ['deskew', 'otsu', 'components', 'band', 'compact', 'upscale', 'pad'],
};

/** The padded crop as it is, with a white border: tesseract binarizes it itself. */
export const PLAIN: CleanupVariant = { name: 'plain', steps: ['pad'] };

export const VARIANTS: readonly CleanupVariant[] = [STANDARD, ADAPTIVE, KEEP_LINES, PLAIN];

export function variantByName(name: string): CleanupVariant {
  const v = VARIANTS.find((x) => x.name === name);
  if (!v) throw new Error(`unknown cleanup variant "${name}"; known: ${VARIANTS.map((x) => x.name).join(', ')}`);
  return v;
}
