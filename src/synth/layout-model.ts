import type { Box } from '../image/geometry.js';
import type { FontKey } from '../image/fonts.js';

/** Detector classes in model index order (shared vocabulary). COCO category id = index + 1. */
export const DETECTOR_CLASSES = ['text_entry', 'checkbox', 'signature_area', 'comb_field'] as const;
export type DetectorClass = (typeof DETECTOR_CLASSES)[number];

export type FieldTypeName =
  | 'text'
  | 'date'
  | 'phone'
  | 'email'
  | 'number'
  | 'postal_code'
  | 'choice_text'
  | 'checkbox'
  | 'choice'
  | 'signature';

/** How an entry area is printed on the blank form. Sizes are page pixels at the reference resolution. */
export type EntryLook =
  | { kind: 'box'; stroke: number; radius: number; tint: number }
  | { kind: 'underline'; stroke: number; dash: number }
  /** A cell of a ruled grid: its lines are printed by the grid, its label sits in the top-left corner. */
  | { kind: 'cell'; labelHeight: number }
  | { kind: 'comb'; stroke: number; cells: number }
  /** Open groups with printed separators between them, e.g. a date as __ / __ / ____. */
  | { kind: 'parts'; stroke: number; parts: number[]; separator: string }
  | { kind: 'lines'; stroke: number; lines: number }
  | { kind: 'checkbox'; stroke: number; shape: 'square' | 'round' }
  | { kind: 'signature'; stroke: number; marker: boolean };

/** One area the detector should find. */
export interface EntrySlot {
  /** Field name, or the choice value for one box of a choice group. */
  key: string;
  class: DetectorClass;
  /** The whole entry area on the reference page. */
  box: Box;
  /** Where the filled value is written (inside box; below the corner label for ruled cells). */
  writeBox: Box;
  look: EntryLook;
}

/** What kind of invented value fills a field (see values/). */
export type ValueKind = string;

export interface LayoutField {
  name: string;
  label: string;
  type: FieldTypeName;
  /** Options exactly as the schema file takes them for this type. */
  options: Record<string, unknown>;
  valueKind: ValueKind;
  required: boolean;
  /** One slot, or one per printed box for a choice group (key = choice value). */
  slots: EntrySlot[];
}

export type Printed =
  | {
      kind: 'text';
      x: number;
      y: number;
      size: number;
      text: string;
      font: FontKey;
      bold?: boolean;
      anchor?: 'start' | 'middle' | 'end';
      gray?: number;
    }
  | { kind: 'line'; x1: number; y1: number; x2: number; y2: number; stroke: number; gray?: number; dash?: number }
  | { kind: 'rect'; box: Box; stroke: number; fillGray?: number; gray?: number };

/** A one-page form layout on the reference page (200 DPI US letter unless stated). */
export interface Layout {
  name: string;
  title: string;
  /** Style family the layout was drawn in (for held-out evaluation by style). */
  family: string;
  width: number;
  height: number;
  printed: Printed[];
  fields: LayoutField[];
}

/** Reference page: US letter at 200 DPI (8.5 in x 11 in). */
export const REFERENCE_DPI = 200;
export const REFERENCE_WIDTH = 1700;
export const REFERENCE_HEIGHT = 2200;
