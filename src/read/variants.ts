import type { CleanupVariant } from './cleanup/pipeline.js';

/**
 * The cleanup recipes readTextField knows. The first is the main one; the rest are second tries when the typed
 * value fails validation. Contents and order are set by measurement (bench/cleanup-gain.ts; numbers in its header).
 */
export const STANDARD: CleanupVariant = {
  name: 'standard',
  steps: ['deskew', 'otsu', 'lines', 'components', 'band', 'compact', 'upscale', 'pad', 'regray'],
};

/** As standard, but tesseract gets the binary mask instead of the gray levels of the kept ink. */
export const BINARY: CleanupVariant = {
  name: 'binary',
  steps: ['deskew', 'otsu', 'lines', 'components', 'band', 'compact', 'upscale', 'pad'],
};

/** Adaptive (Sauvola) binarization for uneven lighting, otherwise as standard. */
export const ADAPTIVE: CleanupVariant = {
  name: 'adaptive',
  steps: ['deskew', 'sauvola', 'lines', 'components', 'band', 'compact', 'upscale', 'pad', 'regray'],
};

/** No rule removal: for writing that runs into the rules, where removal cuts strokes. */
export const KEEP_LINES: CleanupVariant = {
  name: 'keep_lines',
  steps: ['deskew', 'otsu', 'components', 'band', 'compact', 'upscale', 'pad', 'regray'],
};

/** The padded crop as it is, with a white border: tesseract binarizes it itself. */
export const PLAIN: CleanupVariant = { name: 'plain', steps: ['pad'] };

/** Comb fields: separators found and each cell read as one character. */
export const COMB_CELLS: CleanupVariant = { name: 'comb_cells', steps: ['deskew', 'otsu'], perCell: true };

export const VARIANTS: readonly CleanupVariant[] = [STANDARD, BINARY, ADAPTIVE, KEEP_LINES, PLAIN, COMB_CELLS];

export function variantByName(name: string): CleanupVariant {
  const v = VARIANTS.find((x) => x.name === name);
  if (!v) throw new Error(`unknown cleanup variant "${name}"; known: ${VARIANTS.map((x) => x.name).join(', ')}`);
  return v;
}
