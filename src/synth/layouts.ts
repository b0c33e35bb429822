import { clinicIntakeLayout } from './demo/clinic-intake.js';
import { gardenPlotLayout } from './demo/garden-plot.js';
import { marinaSlipLayout } from './demo/marina-slip.js';
import type { Layout } from './layout-model.js';
import type { Rng } from './prng.js';
import { randomLayout } from './random-layout.js';
import { familiesFor, type StyleSelection } from './style-families.js';

/** The invented demo forms: fixed layouts, fresh fills per seed. */
export const DEMO_LAYOUTS = {
  'clinic-intake': clinicIntakeLayout,
  'marina-slip': marinaSlipLayout,
  'garden-plot': gardenPlotLayout,
} as const;

export type DemoLayoutName = keyof typeof DEMO_LAYOUTS;

/** Layout names `samples generate` accepts: the demo forms and `random`. */
export const LAYOUT_NAMES = [...(Object.keys(DEMO_LAYOUTS) as DemoLayoutName[]), 'random'] as const;

export type LayoutName = DemoLayoutName | 'random';

export function isLayoutName(s: string): s is LayoutName {
  return (LAYOUT_NAMES as readonly string[]).includes(s);
}

export function isDemoLayout(s: string): s is DemoLayoutName {
  return s in DEMO_LAYOUTS;
}

const demoCache = new Map<DemoLayoutName, Layout>();

/** A demo form's layout (built once per process; it never changes). */
export function demoLayout(name: DemoLayoutName): Layout {
  let l = demoCache.get(name);
  if (!l) {
    l = DEMO_LAYOUTS[name]();
    demoCache.set(name, l);
  }
  return l;
}

/** The layout for one page: the same demo form every time, or a fresh random one in an allowed style family. */
export function layoutFor(name: LayoutName, rng: Rng, styles: StyleSelection): Layout {
  if (name !== 'random') return demoLayout(name);
  return randomLayout(rng, rng.pick(familiesFor(styles)));
}
