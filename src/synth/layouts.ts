import type { Layout } from './layout-model.js';
import type { Rng } from './prng.js';
import { randomLayout } from './random-layout.js';
import { familiesFor, type StyleSelection } from './style-families.js';

/** Layout names `samples generate` accepts: the demo forms and `random`. */
export const LAYOUT_NAMES = ['random'] as const;

export type LayoutName = (typeof LAYOUT_NAMES)[number];

export function isLayoutName(s: string): s is LayoutName {
  return (LAYOUT_NAMES as readonly string[]).includes(s);
}

/** The layout for one page: the same demo form every time, or a fresh random one in an allowed style family. */
export function layoutFor(name: LayoutName, rng: Rng, styles: StyleSelection): Layout {
  const families = familiesFor(styles);
  return randomLayout(rng, rng.pick(families));
}
