import { LayoutBuilder } from '../layout-builder.js';
import { Rng } from '../prng.js';
import { familyByName } from '../style-families.js';

/** Seed of a demo form's fixed metrics: derived from its name so the form never changes between runs. */
function nameSeed(name: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < name.length; i++) h = Math.imul(h ^ name.charCodeAt(i), 0x01000193);
  return h >>> 0;
}

export function demoBuilder(name: string, family: string): LayoutBuilder {
  return new LayoutBuilder(familyByName(family), new Rng(nameSeed(name)));
}

/** A demo form is fixed: every part must fit, or the form definition is wrong. */
export function must(ok: boolean, layout: string, what: string): void {
  if (!ok) throw new Error(`demo layout ${layout}: "${what}" does not fit on the page`);
}
