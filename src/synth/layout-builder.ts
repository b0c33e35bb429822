import type { Box } from '../image/geometry.js';
import type { FontKey } from '../image/fonts.js';
import type { EntryLook, EntrySlot, FieldTypeName, Layout, LayoutField, Printed } from './layout-model.js';
import { REFERENCE_HEIGHT, REFERENCE_WIDTH } from './layout-model.js';
import type { Rng } from './prng.js';
import type { StyleFamily } from './style-families.js';
import { estimateTextWidth } from './text-metrics.js';

/** A field placed in a row: its share of the row width and how its entry area is printed. */
export interface ItemSpec {
  name: string;
  label: string;
  type: FieldTypeName;
  valueKind: string;
  options?: Record<string, unknown>;
  required?: boolean;
  /** Share of the usable row width, 0..1. */
  span: number;
  /** Override the family's entry look: character boxes, printed date separators, several ruled lines. */
  entry?: 'comb' | 'parts' | 'lines';
  cells?: number;
  lines?: number;
  parts?: number[];
  separator?: string;
}

export interface CheckSpec {
  name: string;
  label: string;
  required?: boolean;
}

export interface ChoiceSpec {
  name: string;
  label: string;
  choices: string[];
  multiple: boolean;
  required?: boolean;
}

export interface TableColumn {
  name: string;
  label: string;
  type: FieldTypeName;
  valueKind: string;
  options?: Record<string, unknown>;
  span: number;
}

/** Sizes at the reference resolution (200 DPI): 10 pt ≈ 28 px. Ranges are common practice for printed forms. */
interface Metrics {
  margin: number;
  labelSize: number;
  entryHeight: number;
  lineHeight: number;
  signatureHeight: number;
  rowGap: number;
  gap: number;
  stroke: number;
  checkbox: number;
  combCell: number;
}

function drawMetrics(rng: Rng, family: StyleFamily): Metrics {
  return {
    margin: rng.int(90, 150),
    labelSize: rng.int(22, 30),
    entryHeight: rng.int(48, 66),
    lineHeight: rng.int(48, 58),
    signatureHeight: rng.int(80, 110),
    rowGap: family.labels === 'cell' ? 0 : rng.int(16, 34),
    gap: family.labels === 'cell' ? 0 : rng.int(22, 40),
    stroke: rng.pick([2, 2, 3, 3, 4]),
    checkbox: rng.int(26, 42),
    combCell: rng.int(34, 46),
  };
}

const r = Math.round;

/** Places titles, sections and rows of fields top to bottom on one page, in one style family. */
export class LayoutBuilder {
  readonly printed: Printed[] = [];
  readonly fields: LayoutField[] = [];
  readonly m: Metrics;
  y: number;
  /** Gray of section bars: one per form. */
  private readonly barGray: number;

  constructor(
    readonly family: StyleFamily,
    private readonly rng: Rng,
    readonly width = REFERENCE_WIDTH,
    readonly height = REFERENCE_HEIGHT,
  ) {
    this.m = drawMetrics(rng, family);
    this.y = this.m.margin;
    this.barGray = rng.int(40, 110);
  }

  get left(): number {
    return this.m.margin;
  }

  get usableWidth(): number {
    return this.width - 2 * this.m.margin;
  }

  /** Space left above the bottom margin (and a footer line). */
  get remaining(): number {
    return this.height - this.m.margin - 40 - this.y;
  }

  private text(x: number, y: number, size: number, text: string, font: FontKey, extra: Partial<Extract<Printed, { kind: 'text' }>> = {}): void {
    this.printed.push({ kind: 'text', x: r(x), y: r(y), size: r(size), text, font, ...extra });
  }

  title(text: string, organisation?: string): void {
    const size = this.rng.int(46, 62);
    const centred = this.rng.chance(0.5);
    const x = centred ? this.width / 2 : this.left;
    const anchor = centred ? 'middle' : 'start';
    if (organisation) {
      this.text(x, this.y + 30, 30, organisation, this.family.labelFont, { anchor, gray: 60 });
      this.y += 44;
    }
    this.text(x, this.y + size, size, text, this.family.titleFont, { bold: true, anchor });
    this.y += size + 18;
    if (this.rng.chance(0.6)) {
      this.printed.push({ kind: 'line', x1: this.left, y1: this.y, x2: this.width - this.left, y2: this.y, stroke: this.rng.int(2, 5) });
    }
    this.y += 30;
  }

  section(text: string): void {
    const size = r(this.m.labelSize * 1.15);
    this.y += 14;
    if (this.family.sections === 'bar') {
      const h = size + 16;
      this.printed.push({ kind: 'rect', box: { x: this.left, y: this.y, w: this.usableWidth, h }, stroke: 0, fillGray: this.barGray });
      this.text(this.left + 12, this.y + h - 11, size, text.toUpperCase(), this.family.labelFont, { bold: true, gray: 255 });
      this.y += h + 16;
    } else if (this.family.sections === 'rule') {
      this.text(this.left, this.y + size, size, text, this.family.labelFont, { bold: true });
      this.y += size + 8;
      this.printed.push({ kind: 'line', x1: this.left, y1: this.y, x2: this.width - this.left, y2: this.y, stroke: 2 });
      this.y += 18;
    } else {
      this.text(this.left, this.y + size, size, text, this.family.labelFont, { bold: true });
      this.y += size + 16;
    }
  }

  /**
   * Printed instructions wrapped to the usable width; `scale` is their size relative to the family's label size.
   * Returns false (and prints nothing) if they do not fit.
   */
  paragraph(text: string, scale = 0.85): boolean {
    const size = r(this.m.labelSize * scale);
    const words = text.split(/\s+/);
    const lines: string[] = [];
    let line = '';
    for (const w of words) {
      const next = line ? `${line} ${w}` : w;
      if (estimateTextWidth(next, this.family.labelFont, size) > this.usableWidth && line) {
        lines.push(line);
        line = w;
      } else line = next;
    }
    if (line) lines.push(line);
    const h = lines.length * r(size * 1.35) + 12;
    if (h > this.remaining) return false;
    for (const l of lines) {
      this.y += r(size * 1.35);
      this.text(this.left, this.y, size, l, this.family.labelFont, { gray: 40 });
    }
    this.y += 12 + this.m.rowGap;
    return true;
  }

  footer(text: string): void {
    const size = r(this.m.labelSize * 0.75);
    this.text(this.left, this.height - this.m.margin + size, size, text, this.family.labelFont, { gray: 70 });
  }

  private entryHeight(item: ItemSpec): number {
    if (item.type === 'signature') return this.m.signatureHeight;
    if (item.entry === 'lines') return (item.lines ?? 3) * this.m.lineHeight;
    if (item.entry === 'comb') return Math.min(this.m.entryHeight, r(this.m.combCell * 1.3));
    return this.m.entryHeight;
  }

  private labelHeight(): number {
    return this.family.labels === 'cell' ? r(this.m.labelSize * 0.72) + 12 : this.m.labelSize + 8;
  }

  private itemHeight(item: ItemSpec, placement: StyleFamily['labels']): number {
    const eh = this.entryHeight(item);
    if (placement === 'beside') return eh;
    if (placement === 'below') return eh + r(this.m.labelSize * 0.8) + 10;
    return this.labelHeight() + eh;
  }

  private placementFor(item: ItemSpec, w: number): StyleFamily['labels'] {
    const p = this.family.labels;
    if (p === 'beside' && estimateTextWidth(item.label, this.family.labelFont, this.m.labelSize) + 16 > w * 0.5) return 'above';
    return p;
  }

  /** Height a row of items takes (0 when empty). */
  rowHeight(items: ItemSpec[]): number {
    const widths = this.itemWidths(items);
    return Math.max(0, ...items.map((it, i) => this.itemHeight(it, this.placementFor(it, widths[i]))));
  }

  /** Widths of a row's items: spans of the usable width, gaps shared so the row ends at the right margin. */
  private itemWidths(items: ItemSpec[]): number[] {
    const gaps = this.m.gap * (items.length - 1);
    return items.map((it) => r(it.span * (this.usableWidth - gaps)));
  }

  /** A row of fields; returns false (placing nothing) when it does not fit on the page. */
  row(items: ItemSpec[]): boolean {
    const rowH = this.rowHeight(items);
    if (rowH > this.remaining) return false;
    const widths = this.itemWidths(items);
    let x = this.left;
    items.forEach((item, i) => {
      const w = i === items.length - 1 ? this.width - this.left - x : widths[i];
      this.placeItem(item, x, this.y, w, rowH, this.placementFor(item, w));
      x += w + this.m.gap;
    });
    this.y += rowH + this.m.rowGap;
    return true;
  }

  private defaultLook(): EntryLook {
    const f = this.family;
    if (f.entry === 'box') return { kind: 'box', stroke: this.m.stroke, radius: f.radius, tint: f.tint };
    if (f.entry === 'underline') return { kind: 'underline', stroke: this.m.stroke, dash: f.dash };
    return { kind: 'cell', labelHeight: this.labelHeight() };
  }

  private placeItem(item: ItemSpec, x: number, y: number, w: number, rowH: number, placement: StyleFamily['labels']): void {
    const L = this.m.labelSize;
    const font = this.family.labelFont;
    const eh = this.entryHeight(item);
    let area: Box;
    if (placement === 'cell') {
      this.printed.push({ kind: 'rect', box: { x, y, w, h: rowH }, stroke: this.m.stroke });
      this.text(x + 8, y + r(L * 0.72) + 5, L * 0.72, item.label, font, { gray: 30 });
      const lh = this.labelHeight();
      area = { x: x + 8, y: y + lh, w: w - 16, h: rowH - lh - 4 };
    } else if (placement === 'beside') {
      const lw = r(estimateTextWidth(item.label, font, L)) + 16;
      const baseline = this.family.entry === 'underline' ? y + eh - 8 : y + r(eh / 2 + L * 0.35);
      this.text(x, baseline, L, item.label, font);
      area = { x: x + lw, y, w: w - lw, h: eh };
    } else if (placement === 'above') {
      this.text(x, y + L, L, item.label, font);
      area = { x, y: y + this.labelHeight(), w, h: eh };
    } else {
      const cs = r(L * 0.8);
      this.text(x, y + eh + cs + 6, cs, item.label, font, { gray: 40 });
      area = { x, y, w, h: eh };
    }
    this.fields.push({
      name: item.name,
      label: item.label,
      type: item.type,
      options: item.options ?? {},
      valueKind: item.valueKind,
      required: item.required ?? false,
      slots: [this.entrySlot(item, area, placement)],
    });
  }

  private entrySlot(item: ItemSpec, area: Box, placement: StyleFamily['labels']): EntrySlot {
    const stroke = this.m.stroke;
    if (item.type === 'signature') {
      if (placement === 'cell') {
        // As for text cells, the area is the whole ruled cell.
        const lh = this.labelHeight();
        const cell = { x: area.x - 8, y: area.y - lh, w: area.w + 16, h: area.h + lh + 4 };
        return { key: item.name, class: 'signature_area', box: cell, writeBox: area, look: { kind: 'cell', labelHeight: lh } };
      }
      const look: EntryLook = { kind: 'signature', stroke, marker: this.rng.chance(0.5) };
      return { key: item.name, class: 'signature_area', box: area, writeBox: inset(area, 4), look };
    }
    if (item.entry === 'comb') {
      const n = item.cells ?? 8;
      const cw = Math.min(this.m.combCell, Math.floor(area.w / n));
      const h = Math.min(area.h, r(cw * 1.3));
      const box = { x: area.x, y: area.y + area.h - h, w: cw * n, h };
      return { key: item.name, class: 'comb_field', box, writeBox: box, look: { kind: 'comb', stroke, cells: n } };
    }
    if (item.entry === 'parts') {
      const parts = item.parts ?? [2, 2, 4];
      const cw = r(this.m.entryHeight * 0.55);
      const sepW = r(this.m.labelSize * 1.1);
      const w = Math.min(area.w, parts.reduce((s, p) => s + p * cw + 12, 0) + sepW * (parts.length - 1));
      const box = { x: area.x, y: area.y, w, h: area.h };
      return { key: item.name, class: 'text_entry', box, writeBox: box, look: { kind: 'parts', stroke, parts, separator: item.separator ?? '/' } };
    }
    if (item.entry === 'lines') {
      const look: EntryLook = { kind: 'lines', stroke, lines: item.lines ?? 3 };
      return { key: item.name, class: 'text_entry', box: area, writeBox: area, look };
    }
    const look = this.defaultLook();
    if (look.kind === 'cell') {
      // The detector's area for a ruled cell is the whole cell, label included (the printed lines bound it).
      const cell = { x: area.x - 8, y: area.y - look.labelHeight, w: area.w + 16, h: area.h + look.labelHeight + 4 };
      return { key: item.name, class: 'text_entry', box: cell, writeBox: area, look };
    }
    return { key: item.name, class: 'text_entry', box: area, writeBox: look.kind === 'box' ? inset(area, 6) : { ...area, h: area.h - 4 }, look };
  }

  private checkboxShape(): 'square' | 'round' {
    const s = this.family.checkboxShape;
    return s === 'mixed' ? this.rng.pick(['square', 'round'] as const) : s;
  }

  /** Lay out checkbox boxes with their labels left to right, wrapping; returns the slots or null if out of room. */
  private checkboxRun(entries: { key: string; label: string }[], startX: number, shape: 'square' | 'round'): { slots: EntrySlot[]; height: number } | null {
    // Box size varies a little between groups on one form, as forms are assembled from parts.
    const s = Math.max(22, this.m.checkbox + this.rng.int(-6, 6));
    const L = this.m.labelSize;
    const lineH = Math.max(s, L) + 14;
    let x = startX;
    let y = this.y;
    const right = this.width - this.left;
    const placed: { slot: EntrySlot; label: { x: number; y: number; text: string } }[] = [];
    for (const e of entries) {
      const w = s + 12 + r(estimateTextWidth(e.label, this.family.labelFont, L)) + 40;
      if (x + w > right && x > startX) {
        x = startX;
        y += lineH;
      }
      const box = { x, y: y + r((lineH - 14 - s) / 2), w: s, h: s };
      placed.push({
        slot: { key: e.key, class: 'checkbox', box, writeBox: box, look: { kind: 'checkbox', stroke: Math.min(this.m.stroke, 3), shape } },
        label: { x: x + s + 12, y: box.y + r(s / 2 + L * 0.36), text: e.label },
      });
      x += w;
    }
    const height = y + lineH - this.y;
    if (height > this.remaining) return null;
    for (const p of placed) this.text(p.label.x, p.label.y, L, p.label.text, this.family.labelFont);
    return { slots: placed.map((p) => p.slot), height };
  }

  /** Independent yes/no checkboxes, each its own field. */
  checks(items: CheckSpec[]): boolean {
    const shape = this.checkboxShape();
    const run = this.checkboxRun(items.map((i) => ({ key: i.name, label: i.label })), this.left, shape);
    if (!run) return false;
    items.forEach((item, i) => {
      this.fields.push({ name: item.name, label: item.label, type: 'checkbox', options: {}, valueKind: 'checkbox', required: item.required ?? false, slots: [run.slots[i]] });
    });
    this.y += run.height + this.m.rowGap;
    return true;
  }

  /** A question with one printed box per choice. */
  choice(spec: ChoiceSpec): boolean {
    const L = this.m.labelSize;
    const lead = r(estimateTextWidth(spec.label, this.family.labelFont, L)) + 24;
    const shape = this.checkboxShape();
    const run = this.checkboxRun(spec.choices.map((c) => ({ key: c, label: c })), this.left + lead, shape);
    if (!run) return false;
    const first = run.slots[0].box;
    this.text(this.left, first.y + r(first.h / 2 + L * 0.36), L, spec.label, this.family.labelFont);
    this.fields.push({
      name: spec.name,
      label: spec.label,
      type: 'choice',
      options: { multiple: spec.multiple },
      valueKind: 'choice',
      required: spec.required ?? false,
      slots: run.slots,
    });
    this.y += run.height + this.m.rowGap;
    return true;
  }

  /** A ruled table: a header row of column labels and `rows` rows of cells, each cell its own field. */
  table(prefix: string, columns: TableColumn[], rows: number): boolean {
    const L = r(this.m.labelSize * 0.85);
    const headH = L + 18;
    const cellH = this.m.entryHeight;
    if (headH + rows * cellH > this.remaining) return false;
    const total = columns.reduce((s, c) => s + c.span, 0);
    const stroke = this.m.stroke;
    let x = this.left;
    const xs = columns.map((c) => {
      const x0 = x;
      x += r((c.span / total) * this.usableWidth);
      return x0;
    });
    xs.push(this.left + this.usableWidth);
    const shade = this.rng.chance(0.5) ? this.rng.int(200, 235) : undefined;
    this.printed.push({ kind: 'rect', box: { x: this.left, y: this.y, w: this.usableWidth, h: headH }, stroke, fillGray: shade });
    columns.forEach((c, i) => this.text(xs[i] + 8, this.y + headH - 10, L, c.label, this.family.labelFont, { bold: true }));
    const top = this.y + headH;
    for (let row = 0; row < rows; row++) {
      const y = top + row * cellH;
      columns.forEach((c, i) => {
        const box = { x: xs[i], y, w: xs[i + 1] - xs[i], h: cellH };
        this.fields.push({
          name: `${prefix}_${row + 1}_${c.name}`,
          label: `${c.label} (row ${row + 1})`,
          type: c.type,
          options: c.options ?? {},
          valueKind: c.valueKind,
          required: false,
          slots: [{ key: `${prefix}_${row + 1}_${c.name}`, class: 'text_entry', box, writeBox: inset(box, 6), look: { kind: 'box', stroke, radius: 0, tint: 255 } }],
        });
      });
    }
    this.y = top + rows * cellH + this.m.rowGap + 10;
    return true;
  }

  build(name: string, title: string): Layout {
    return { name, title, family: this.family.name, width: this.width, height: this.height, printed: this.printed, fields: this.fields };
  }
}

function inset(b: Box, d: number): Box {
  return { x: b.x + d, y: b.y + d, w: Math.max(1, b.w - 2 * d), h: Math.max(1, b.h - 2 * d) };
}
