import type { Detection } from '../detect/types.js';
import type { Box } from '../image/geometry.js';
import { center, iou, unionBox } from '../image/geometry.js';
import { inkThreshold } from '../image/ink.js';
import { cropGray } from '../image/raster.js';
import { snapToRules } from '../page/snap-box.js';
import { hasRule, hasWritingSpace, printedMark } from './printed-mark.js';
import type { GrayImage } from '../image/raster.js';
import type { Phrase } from '../page/text-phrases.js';
import { findPhrases } from '../page/text-phrases.js';
import { FormSchema } from '../schema/definition.js';

/**
 * Schema drafting from a blank form: every detected entry area becomes a field; the printed phrase nearest to
 * it (inside the cell's top-left corner, to its left, above it, to the right of a checkbox, or under a signature
 * line) is read as its label; the label gives the field's name (a slug) and, with the area's class and shape,
 * a guessed type. The draft is meant for a person to edit, so every guess is plain and visible.
 */

export type Region = [number, number, number, number];

/** Reads one printed phrase (a crop of the page) and returns its text. */
export type LabelReader = (crop: GrayImage) => Promise<string>;

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
  /** Detections left out: checkboxes with no printed square or circle under them (letters, brackets), other
   *  areas with no printed rule along them (body text, headings), and text entries filled with print (table
   *  header cells, section bands). */
  dropped: { checkboxWithoutMark: number; withoutRule: number; noWritingSpace: number };
}

export type LabelSide = 'inside' | 'left' | 'above' | 'right' | 'below';

function toRegion(b: Box): Region {
  return [Math.max(0, Math.round(b.x)), Math.max(0, Math.round(b.y)), Math.max(1, Math.round(b.w)), Math.max(1, Math.round(b.h))];
}

/**
 * The phrase that labels an area, with the side it sits on. Distances are in units of the phrase's character
 * height so the rule holds at any resolution; the limits (a cell-corner label within half the cell; a left
 * label within 12 characters' height; an above label within 3; a checkbox's right label within 2; a caption
 * below a signature or date line within 2) follow how printed forms are laid out (common practice). `rowLabels` are phrases that
 * already stand right before some area on their own row ("City ____"); they are not taken as a label above.
 * `cellCaptions` are phrases printed inside some area's upper part (a cell's corner label); they are not taken as
 * the caption below another area.
 */
export function labelFor(
  area: Box,
  className: string,
  phrases: readonly Phrase[],
  rowLabels: ReadonlySet<Phrase> = new Set(),
  cellCaptions: ReadonlySet<Phrase> = new Set(),
): { phrase: Phrase; side: LabelSide; far: boolean } | null {
  let best: { phrase: Phrase; side: LabelSide; cost: number; far: boolean } | null = null;
  // `far`: the gap is over half of what the side allows, so the phrase may be another area's label.
  const consider = (phrase: Phrase, side: LabelSide, cost: number, far = false) => {
    if (!best || cost < best.cost) best = { phrase, side, cost, far };
  };
  const [acx, acy] = center(area);
  for (const p of phrases) {
    // A lone component is a required-mark, a bullet or the "X" of a signature line, not a label.
    if (p.glyphs < 2) continue;
    const b = p.box;
    const ch = Math.max(4, p.charHeight);
    const [pcx, pcy] = center(b);
    const inRowBand = pcy >= area.y - 0.25 * area.h && pcy <= area.y + 1.25 * area.h;
    const overlapsColumns = b.x < area.x + area.w && b.x + b.w > area.x;
    // Inside the cell, in its upper part: the label printed in the cell's corner. A caption inside the cell's own
    // rules belongs to it whatever stands outside (a step heading in the margin, "Enter ..." on the W-4), so it
    // is preferred by two character heights.
    if (pcx > area.x && pcx < area.x + area.w && b.y >= area.y - 2 && b.y + b.h <= area.y + 0.6 * area.h && b.h < 0.6 * area.h) {
      consider(p, 'inside', (b.y - area.y) / ch + (0.1 * (b.x - area.x)) / ch - 2);
    }
    // Left, on the same row (a label may touch the start of an underline).
    const leftGap = area.x - (b.x + b.w);
    if (leftGap >= -0.5 * ch && pcx < area.x && inRowBand && leftGap <= 12 * ch) {
      consider(p, 'left', leftGap / ch + (className === 'checkbox' ? 1 : 0), leftGap > 6 * ch);
    }
    // Above, starting over the area's left part — unless the phrase is the row label of another area.
    const aboveGap = area.y - (b.y + b.h);
    if (!rowLabels.has(p) && aboveGap >= -2 && aboveGap <= 3 * ch && b.x >= area.x - 2 * ch && b.x <= area.x + 0.5 * area.w) {
      consider(p, 'above', aboveGap / ch + Math.abs(b.x - area.x) / (4 * ch) + (className === 'checkbox' ? 2 : className === 'signature_area' ? 1 : 0), aboveGap > 1.5 * ch);
    }
    // Right of a checkbox (or of any small square mark area).
    const rightGap = b.x - (area.x + area.w);
    if (className === 'checkbox' && rightGap >= -2 && rightGap <= 2 * ch && Math.abs(pcy - acy) <= 0.6 * Math.max(area.h, b.h)) {
      consider(p, 'right', rightGap / ch, rightGap > ch);
    }
    // Below: the caption under a signature or date line; for other areas only when nothing sits left or above,
    // unless the layout prints its captions under the lines: a phrase starting where the line starts, right under
    // it, and not the corner caption of another cell, is that line's caption ("First name" under the first of
    // three lines) and comes before a phrase on the left.
    const belowGap = b.y - (area.y + area.h);
    if (className !== 'checkbox' && belowGap >= -2 && belowGap <= 2 * ch && overlapsColumns && b.x >= area.x - 2 * ch && Math.abs(pcx - acx) <= area.w) {
      const caption = belowGap <= 1.5 * ch && Math.abs(b.x - area.x) <= 1.5 * ch && !cellCaptions.has(p);
      consider(p, 'below', (className === 'signature_area' || caption ? -1 : 3) + belowGap / ch, belowGap > ch);
    }
  }
  const found = best as { phrase: Phrase; side: LabelSide; cost: number; far: boolean } | null;
  return found ? { phrase: found.phrase, side: found.side, far: found.far } : null;
}

/** Strip what OCR and form conventions add around a label: item markers, required-marks, trailing colons, stray rules. */
export function cleanLabel(text: string): string {
  return text
    .replace(/\s+/g, ' ')
    // Item markers before a label: "(a)", "b)", "4(c)", "12.", "3)".
    .replace(/^\s*(\d*\(?[a-z]\)|\d+[.)])\s+/i, '')
    .replace(/^[\s|_.:;,\-–—*(]+/, '')
    .replace(/[\s|_.:;,\-–—*]+$/, '')
    .replace(/\s*\*\s*$/, '')
    .trim();
}

/**
 * A field name from a label: lower case ASCII letters, digits and _, starting with a letter (the schema's rule),
 * at most 40 characters cut at a word boundary. Accents are folded (é -> e) by Unicode decomposition.
 */
export function slugName(label: string): string {
  const words = label
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[\u2018\u2019`]/g, "'")
    .replace(/'s\b/g, '')
    .split(/[^a-z0-9]+/)
    .filter((w) => w.length > 0);
  let out = '';
  for (const w of words) {
    const next = out ? `${out}_${w}` : w;
    if (next.length > 40) break;
    out = next;
  }
  if (!out) return '';
  return /^[a-z]/.test(out) ? out : `field_${out}`.slice(0, 40);
}

export interface TypeGuess {
  type: string;
  options?: Record<string, unknown>;
  ocr?: DraftedField['ocr'];
}

const has = (label: string, ...words: string[]) => words.some((w) => new RegExp(`(^|[^a-z])${w}([^a-z]|$)`).test(label));

/**
 * The field type a label and an area suggest. Words are matched whole, case-folded; the order puts the more
 * specific readings first (an "e-mail" label mentioning a date is still e-mail). Common practice of form design;
 * the word lists are ours.
 */
export function guessType(label: string | null, className: string, area: Box, charHeight: number): TypeGuess {
  if (className === 'checkbox') return { type: 'checkbox' };
  if (className === 'signature_area') return { type: 'signature' };
  const l = (label ?? '').toLowerCase();
  if (has(l, 'signature', 'signed by', 'sign here')) return { type: 'signature' };
  if (has(l, 'e-mail', 'email', 'e mail')) return { type: 'email' };
  if (has(l, 'phone', 'telephone', 'tel', 'mobile', 'cell', 'fax')) return { type: 'phone', options: { defaultRegion: 'US' } };
  if (has(l, 'zip', 'zip code')) return { type: 'postal_code', options: { country: 'US' } };
  if (has(l, 'postcode')) return { type: 'postal_code', options: { country: 'GB' } };
  if (has(l, 'postal code', 'postal')) return { type: 'postal_code', options: { country: l.includes('canada') ? 'CA' : 'US' } };
  if (has(l, 'date', 'dob', 'birth', 'born', 'arrival', 'departure', 'expires', 'expiry')) {
    return { type: 'date', options: { formats: ['MM/DD/YYYY', 'YYYY-MM-DD', 'D MMM YYYY'] } };
  }
  if (l.includes('$') || has(l, 'amount', 'total', 'income', 'deductions', 'withholding', 'fee', 'price', 'cost')) {
    return { type: 'number', options: { decimalSeparator: '.', ...(l.includes('$') ? { unit: '$' } : {}) } };
  }
  if (has(l, 'number of', 'qty', 'quantity', 'count', 'age', 'size', 'weight', 'length', 'beam', 'draft', 'height', 'width', 'kg', 'lb', 'ft', 'sq ft')) {
    const unit = /\((kg|lb|lbs|ft|m|cm|in|sq ft)\)/.exec(l)?.[1];
    return { type: 'number', options: { decimalSeparator: '.', ...(unit ? { unit } : {}) } };
  }
  // Tall areas hold several lines of writing.
  if (area.h > 3.5 * Math.max(8, charHeight) * 1.6) return { type: 'text', ocr: { mode: 'block' } };
  return { type: 'text' };
}

function uniqueName(base: string, used: Set<string>): string {
  if (!used.has(base)) {
    used.add(base);
    return base;
  }
  for (let i = 2; ; i++) {
    const n = `${base}_${i}`.slice(0, 48);
    if (!used.has(n)) {
      used.add(n);
      return n;
    }
  }
}

/**
 * Read a phrase with a margin of a third of its character height around it (common practice for OCR crops), and a
 * full character height on the right, where a trailing colon or period (too small to count as a character
 * component) may sit.
 */
async function readPhrase(page: GrayImage, p: Phrase, reader: LabelReader, masks: readonly Box[]): Promise<string> {
  const pad = Math.max(3, Math.round(p.charHeight / 3));
  const right = Math.max(pad, Math.round(p.charHeight));
  const box = { x: p.box.x - pad, y: p.box.y - pad, w: p.box.w + pad + right, h: p.box.h + 2 * pad };
  const crop = cropGray(page, box);
  // A checkbox frame or comb printed right against the label would be read as a letter ("|" or "I" glued to the
  // first word: "icharacter_of_service" on the DD 293): paper over them, a pixel beyond their outline.
  // The crop's origin on the page, as cropGray places it (rounded down, clamped at the page edge).
  const ox = Math.max(0, Math.floor(box.x));
  const oy = Math.max(0, Math.floor(box.y));
  for (const m of masks) {
    const x0 = Math.max(0, Math.floor(m.x - 1 - ox));
    const y0 = Math.max(0, Math.floor(m.y - 1 - oy));
    const x1 = Math.min(crop.width, Math.ceil(m.x + m.w + 1 - ox));
    const y1 = Math.min(crop.height, Math.ceil(m.y + m.h + 1 - oy));
    for (let y = y0; y < y1; y++) crop.data.fill(255, y * crop.width + x0, y * crop.width + Math.max(x0, x1));
  }
  return (await reader(crop)).replace(/\s+/g, ' ').trim();
}

/** Phrases that end right before an area on its row, within two character heights: that area's label. */
export function rowLabelPhrases(areas: readonly Box[], phrases: readonly Phrase[]): Set<Phrase> {
  const out = new Set<Phrase>();
  for (const p of phrases) {
    const ch = Math.max(4, p.charHeight);
    const cy = p.box.y + p.box.h / 2;
    for (const a of areas) {
      const gap = a.x - (p.box.x + p.box.w);
      if (gap >= -0.5 * ch && gap <= 2 * ch && p.box.x + p.box.w / 2 < a.x && cy >= a.y - 0.25 * a.h && cy <= a.y + 1.25 * a.h) {
        out.add(p);
        break;
      }
    }
  }
  return out;
}

/** Phrases printed in the upper part of some area (a cell's corner caption). */
export function cellCaptionPhrases(areas: readonly Box[], phrases: readonly Phrase[]): Set<Phrase> {
  const out = new Set<Phrase>();
  for (const p of phrases) {
    const [cx, cy] = center(p.box);
    if (areas.some((a) => cx > a.x && cx < a.x + a.w && p.box.y >= a.y - 2 && cy <= a.y + 0.6 * a.h)) out.add(p);
  }
  return out;
}

/** The nearest phrase left of an area on its row, within six character heights (a group's lead label). */
function leftPhrase(area: Box, phrases: readonly Phrase[]): Phrase | null {
  let best: Phrase | null = null;
  let bestGap = Infinity;
  for (const p of phrases) {
    const gap = area.x - (p.box.x + p.box.w);
    const cy = p.box.y + p.box.h / 2;
    if (gap >= -2 && gap <= 6 * Math.max(4, p.charHeight) && cy >= area.y - 0.25 * area.h && cy <= area.y + 1.25 * area.h && gap < bestGap) {
      best = p;
      bestGap = gap;
    }
  }
  return best;
}

interface Candidate {
  det: Detection;
  phrase: Phrase | null;
  side: LabelSide | null;
  far: boolean;
  /** OCR text of the phrase as read (before cleaning), or null. */
  text: string | null;
}

/**
 * Rows of checkboxes whose own labels sit to their right and whose row starts with a label ending in a colon
 * ("Species:  [ ] Dog  [ ] Cat") read as one choice question (common practice of form layout).
 */
function checkboxGroups(cands: readonly Candidate[]): Candidate[][] {
  const boxes = cands.filter((c) => c.det.className === 'checkbox' && c.side === 'right').sort((a, b) => a.det.box.x - b.det.box.x);
  const rows: Candidate[][] = [];
  for (const c of boxes) {
    const cy = c.det.box.y + c.det.box.h / 2;
    const row = rows.find((r) => Math.abs(r[0].det.box.y + r[0].det.box.h / 2 - cy) <= 0.5 * c.det.box.h);
    if (row) row.push(c);
    else rows.push([c]);
  }
  return rows.filter((r) => r.length >= 2);
}

/**
 * One field per place: detections of different classes on the same spot (a checkbox found inside a text entry, a
 * text entry doubling a comb) are resolved in favour of the higher score. Boxes overlapping by IoU >= 0.3, or one
 * lying 70 % inside the other, count as the same spot (common practice for cross-class suppression).
 */
export function suppressAcrossClasses(dets: readonly Detection[]): Detection[] {
  const kept: Detection[] = [];
  const within = (a: Box, b: Box) => {
    const ix = Math.max(0, Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x));
    const iy = Math.max(0, Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y));
    return (ix * iy) / Math.max(1e-9, Math.min(a.w * a.h, b.w * b.h));
  };
  for (const d of [...dets].sort((a, b) => b.score - a.score)) {
    if (kept.some((k) => iou(k.box, d.box) >= 0.3 || within(k.box, d.box) >= 0.7)) continue;
    kept.push(d);
  }
  return kept;
}

/**
 * Draft a schema from blank pages (upright, deskewed) and their detections. `readLabel` reads a phrase crop
 * (the CLI passes the tesseract engine). `schema` is the validated schema; `source` is the same content without
 * the defaults validation fills in, for writing a compact file.
 */
export async function draftSchema(
  pages: readonly GrayImage[],
  detections: readonly (readonly Detection[])[],
  readLabel: LabelReader,
  options: DraftOptions,
): Promise<SchemaDraft> {
  const fields: DraftedField[] = [];
  const used = new Set<string>();
  const dropped = { checkboxWithoutMark: 0, withoutRule: 0, noWritingSpace: 0 };
  for (let pi = 0; pi < pages.length; pi++) {
    const page = pages[pi];
    // Detector boxes are good to a few pixels; the blank's printed frames and underlines are exact. On a blank
    // form every checkbox is a printed square, so a checkbox detection without one is dropped.
    const threshold = inkThreshold(page);
    const dets = suppressAcrossClasses(detections[pi] ?? [])
      .flatMap((d) => {
        if (d.className !== 'checkbox') {
          const box = snapToRules(page, d.box, { threshold, prefer: d.className === 'comb_field' ? 'outer' : 'inner' });
          if (!hasRule(page, box, threshold)) {
            dropped.withoutRule++;
            return [];
          }
          if (d.className === 'text_entry' && !hasWritingSpace(page, box, threshold)) {
            dropped.noWritingSpace++;
            return [];
          }
          return [{ ...d, box }];
        }
        const frame = printedMark(page, d.box, threshold);
        if (!frame) dropped.checkboxWithoutMark++;
        return frame ? [{ ...d, box: frame }] : [];
      })
      .sort((a, b) => a.box.y - b.box.y || a.box.x - b.box.x);
    // Checkbox frames and comb cells are ink of glyph size; keep them out of the phrases.
    const marks = dets.filter((d) => d.className === 'checkbox' || d.className === 'comb_field').map((d) => d.box);
    const phrases = findPhrases(page, { exclude: marks });
    const typical = phrases.length ? [...phrases.map((p) => p.charHeight)].sort((a, b) => a - b)[phrases.length >> 1] : 16;
    const texts = new Map<Phrase, Promise<string>>();
    const read = (p: Phrase): Promise<string> => {
      let t = texts.get(p);
      if (!t) {
        t = readPhrase(page, p, readLabel, marks);
        texts.set(p, t);
      }
      return t;
    };
    const cands: Candidate[] = [];
    const rowLabels = rowLabelPhrases(dets.map((d) => d.box), phrases);
    const cellCaptions = cellCaptionPhrases(dets.map((d) => d.box), phrases);
    for (const det of dets) {
      const found = labelFor(det.box, det.className, phrases, rowLabels, cellCaptions);
      cands.push({ det, phrase: found?.phrase ?? null, side: found?.side ?? null, far: found?.far ?? false, text: found ? await read(found.phrase) : null });
    }
    // Rows of a table carry their column's header only over the first row: an unlabelled area takes the label of
    // the area right above it in the same column (same class, same left edge and width within a character).
    for (const c of cands) {
      if (c.text) continue;
      const b = c.det.box;
      const above = cands
        .filter((o) => o !== c && o.text && o.det.className === c.det.className && o.det.box.y + o.det.box.h <= b.y + 2)
        .filter((o) => Math.abs(o.det.box.x - b.x) <= typical && Math.abs(o.det.box.w - b.w) <= typical)
        .sort((p, q) => q.det.box.y - p.det.box.y)[0];
      if (above && b.y - (above.det.box.y + above.det.box.h) <= 2 * b.h) {
        c.text = above.text;
        c.side = 'above';
      }
    }
    const grouped = new Map<Candidate, { lead: Phrase; leadText: string; members: Candidate[] }>();
    for (const row of checkboxGroups(cands)) {
      const lead = leftPhrase(row[0].det.box, phrases);
      if (!lead) continue;
      const leadText = await read(lead);
      if (!leadText.trim().endsWith(':')) continue;
      const group = { lead, leadText, members: row };
      for (const c of row) grouped.set(c, group);
    }
    const emitted = new Set<object>();
    for (const c of cands) {
      const group = grouped.get(c);
      if (group) {
        if (emitted.has(group)) continue;
        emitted.add(group);
        const label = cleanLabel(group.leadText) || null;
        const region = unionBox(group.members.map((m) => m.det.box));
        const values = new Set<string>();
        const choices = group.members.map((m, i) => {
          const base = (m.text && cleanLabel(m.text)) || `option ${i + 1}`;
          const value = values.has(base) ? `${base} ${i + 1}` : base;
          values.add(value);
          return { value, region: toRegion(m.det.box) };
        });
        fields.push({
          name: uniqueName((label && slugName(label)) || `choice_${fields.length + 1}`, used),
          label,
          type: 'choice',
          className: 'checkbox',
          page: pi,
          region: toRegion(region),
          labelBox: group.lead.box,
          labelSide: 'left',
          detectionScore: Math.min(...group.members.map((m) => m.det.score)),
          options: { multiple: false, choices },
        });
        continue;
      }
      const label = (c.text && cleanLabel(c.text)) || null;
      const guess = guessType(label, c.det.className, c.det.box, typical);
      fields.push({
        name: uniqueName((label && slugName(label)) || `${c.det.className}_${fields.length + 1}`, used),
        label,
        type: guess.type,
        className: c.det.className,
        page: pi,
        region: toRegion(c.det.box),
        labelBox: c.phrase?.box ?? null,
        labelSide: c.side,
        ...(c.far ? { labelFar: true } : {}),
        detectionScore: c.det.score,
        ...(guess.options ? { options: guess.options } : {}),
        ...(guess.ocr ? { ocr: guess.ocr } : {}),
      });
    }
  }
  const source = {
    form: { name: options.formName, version: options.version ?? '1', ...(options.description ? { description: options.description } : {}) },
    pages: pages.map((p, i) => ({ width: p.width, height: p.height, ...(options.referenceImages[i] ? { image: options.referenceImages[i] } : {}) })),
    fields: fields.map((f) => ({
      name: f.name,
      ...(f.label ? { label: f.label } : {}),
      type: f.type,
      class: f.className,
      page: f.page,
      region: f.region,
      ...(f.options ? { options: f.options } : {}),
      ...(f.ocr ? { ocr: f.ocr } : {}),
    })),
  };
  return { schema: FormSchema.parse(source), source, fields, dropped };
}

/** Every drafted entry area on its own: a field's region, or each option of a drafted choice. */
export function draftedAreas(fields: readonly DraftedField[]): Array<{ box: Box; className: string; field: DraftedField }> {
  return fields.flatMap((f) => {
    const choices = f.type === 'choice' ? (f.options as { choices?: Array<{ region: Region }> } | undefined)?.choices : undefined;
    const regions = choices ? choices.map((c) => c.region) : [f.region];
    return regions.map(([x, y, w, h]) => ({ box: { x, y, w, h }, className: f.className, field: f }));
  });
}
