import type { Box } from '../image/geometry.js';
import type { FormSchema } from '../schema/definition.js';

// What a drafted schema is made of: the fields as proposed from a blank, before a person edits them.

/** [x, y, w, h] in whole pixels of the blank page, as the schema writes a region. */
export type Region = [number, number, number, number];

/** How the label sits relative to the area. */
export type LabelSide = 'inside' | 'left' | 'above' | 'right' | 'below';

export interface DraftOptions {
  formName: string;
  version?: string;
  description?: string;
  /** Per page: the reference image path as the schema should name it (relative to the schema file). */
  referenceImages: readonly (string | undefined)[];
}

export interface DraftedField {
  name: string;
  label: string | null;
  type: string;
  className: string;
  page: number;
  region: Region;
  /** Where the label was read, page pixels. */
  labelBox: Box | null;
  /** How the label sits relative to the area. */
  labelSide: LabelSide | null;
  /** The label sits at the far end of what its side allows (more than half the limit away): a guess to check. */
  labelFar?: boolean;
  detectionScore: number;
  options?: Record<string, unknown>;
  ocr?: { mode: 'line' | 'block' | 'word' | 'char'; allowed?: string };
}

export interface SchemaDraft {
  schema: FormSchema;
  /** The schema as drafted, without the defaults that validation adds: what gets written to the file. */
  source: Record<string, unknown>;
  fields: DraftedField[];
  dropped: DroppedAreas;
}

/** Detections left out of a draft, by why. */
export interface DroppedAreas {
  /** Checkboxes with no printed square or circle under them (letters, brackets). */
  checkboxWithoutMark: number;
  /** Other areas with no printed rule along them (body text, headings). */
  withoutRule: number;
  /** Text entries filled with print (table header cells, section bands). */
  noWritingSpace: number;
}

/** A box as a schema region: whole pixels, on the page, at least one pixel wide and high. */
export function toRegion(b: Box): Region {
  return [Math.max(0, Math.round(b.x)), Math.max(0, Math.round(b.y)), Math.max(1, Math.round(b.w)), Math.max(1, Math.round(b.h))];
}

/** Every drafted entry area on its own: a field's region, or each option of a drafted choice. */
export function draftedAreas(fields: readonly DraftedField[]): Array<{ box: Box; className: string; field: DraftedField }> {
  return fields.flatMap((f) => {
    const choices = f.type === 'choice' ? (f.options as { choices?: Array<{ region: Region }> } | undefined)?.choices : undefined;
    const regions = choices ? choices.map((c) => c.region) : [f.region];
    return regions.map(([x, y, w, h]) => ({ box: { x, y, w, h }, className: f.className, field: f }));
  });
}
