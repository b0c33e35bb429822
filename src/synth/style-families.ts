import type { FontKey } from '../image/fonts.js';

/**
 * Families of form styles for randomized layouts. Each family fixes how labels sit relative to entry areas and how
 * entry areas are printed; sizes vary within a family. One family is held out of training so that detector
 * evaluation can measure how it does on a style it never saw.
 */
export interface StyleFamily {
  name: string;
  heldOut: boolean;
  /** beside: label left of the area; above: label over it; cell: ruled grid, small label in the cell's top-left
   *  corner and the value below it; below: a small caption under the line. */
  labels: 'beside' | 'above' | 'cell' | 'below';
  entry: 'box' | 'underline' | 'cell';
  labelFont: FontKey;
  titleFont: FontKey;
  checkboxShape: 'square' | 'round' | 'mixed';
  radius: number;
  /** Gray level of the entry-area background (255 = none). */
  tint: number;
  /** Dash length of underlines (0 = solid). */
  dash: number;
  sections: 'bar' | 'rule' | 'plain';
}

export const STYLE_FAMILIES: readonly StyleFamily[] = [
  { name: 'ledger', heldOut: false, labels: 'beside', entry: 'underline', labelFont: 'serif', titleFont: 'serif', checkboxShape: 'square', radius: 0, tint: 255, dash: 0, sections: 'rule' },
  { name: 'boxed-above', heldOut: false, labels: 'above', entry: 'box', labelFont: 'sans', titleFont: 'sans', checkboxShape: 'square', radius: 0, tint: 255, dash: 0, sections: 'bar' },
  { name: 'boxed-beside', heldOut: false, labels: 'beside', entry: 'box', labelFont: 'sans', titleFont: 'serif', checkboxShape: 'mixed', radius: 0, tint: 255, dash: 0, sections: 'plain' },
  { name: 'ruled-grid', heldOut: false, labels: 'cell', entry: 'cell', labelFont: 'sans', titleFont: 'sans', checkboxShape: 'square', radius: 0, tint: 255, dash: 0, sections: 'bar' },
  { name: 'caption-below', heldOut: false, labels: 'below', entry: 'underline', labelFont: 'sans', titleFont: 'serif', checkboxShape: 'round', radius: 0, tint: 255, dash: 0, sections: 'rule' },
  { name: 'soft-tinted', heldOut: true, labels: 'above', entry: 'box', labelFont: 'serif', titleFont: 'sans', checkboxShape: 'round', radius: 10, tint: 232, dash: 0, sections: 'plain' },
  { name: 'dotted-lines', heldOut: true, labels: 'beside', entry: 'underline', labelFont: 'mono', titleFont: 'mono', checkboxShape: 'square', radius: 0, tint: 255, dash: 6, sections: 'bar' },
];

export type StyleSelection = 'train' | 'heldout' | 'all';

export function familiesFor(selection: StyleSelection): StyleFamily[] {
  if (selection === 'all') return STYLE_FAMILIES.slice();
  return STYLE_FAMILIES.filter((f) => f.heldOut === (selection === 'heldout'));
}

export function familyByName(name: string): StyleFamily {
  const f = STYLE_FAMILIES.find((s) => s.name === name);
  if (!f) throw new Error(`unknown style family "${name}"`);
  return f;
}
