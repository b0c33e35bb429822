import type { Detection } from '../detect/types.js';
import { unionBox } from '../image/geometry.js';
import { inkThreshold } from '../image/ink.js';
import type { GrayImage } from '../image/raster.js';
import type { Phrase } from '../page/text-phrases.js';
import { findPhrases } from '../page/text-phrases.js';
import { FormSchema } from '../schema/definition.js';
import { checkboxGroups, type Candidate } from './choice-groups.js';
import { toRegion, type DraftedField, type DraftOptions, type DroppedAreas, type SchemaDraft } from './drafted-field.js';
import { entryAreasOfBlank } from './entry-areas.js';
import { cleanLabel, slugName, uniqueName } from './field-name.js';
import { cellCaptionPhrases, labelFor, leftPhrase, rowLabelPhrases } from './label-place.js';
import { readPhrase, type LabelReader } from './label-read.js';
import { guessType } from './type-guess.js';

/**
 * Schema drafting from a blank form: every detected entry area becomes a field (entry-areas.ts); the printed phrase
 * nearest to it (inside the cell's top-left corner, to its left, above it, to the right of a checkbox, or under a
 * signature line: label-place.ts) is read as its label (label-read.ts); the label gives the field's name
 * (field-name.ts) and, with the area's class and shape, a guessed type (type-guess.ts). Rows of checkboxes led by a
 * "Question:" label become one choice (choice-groups.ts). The draft is meant for a person to edit, so every guess
 * is plain and visible.
 */

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
  const dropped: DroppedAreas = { checkboxWithoutMark: 0, withoutRule: 0, noWritingSpace: 0 };
  for (let pi = 0; pi < pages.length; pi++) {
    const page = pages[pi];
    const dets = entryAreasOfBlank(page, detections[pi] ?? [], inkThreshold(page), dropped);
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
    const cands = await labelledAreas(dets, phrases, typical, read);
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
        fields.push(choiceField(group, pi, fields.length, used));
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
  const source = schemaSource(pages, fields, options);
  return { schema: FormSchema.parse(source), source, fields, dropped };
}

/**
 * Each area with its label, read. Rows of a table carry their column's header only over the first row: an
 * unlabelled area takes the label of the area right above it in the same column (same class, same left edge and
 * width within a character).
 */
async function labelledAreas(
  dets: readonly Detection[],
  phrases: readonly Phrase[],
  typical: number,
  read: (p: Phrase) => Promise<string>,
): Promise<Candidate[]> {
  const cands: Candidate[] = [];
  const rowLabels = rowLabelPhrases(dets.map((d) => d.box), phrases);
  const cellCaptions = cellCaptionPhrases(dets.map((d) => d.box), phrases);
  for (const det of dets) {
    const found = labelFor(det.box, det.className, phrases, rowLabels, cellCaptions);
    cands.push({ det, phrase: found?.phrase ?? null, side: found?.side ?? null, far: found?.far ?? false, text: found ? await read(found.phrase) : null });
  }
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
  return cands;
}

/** A row of checkboxes led by its question as one choice field: one choice per box, valued by the box's own label. */
function choiceField(
  group: { lead: Phrase; leadText: string; members: Candidate[] },
  page: number,
  index: number,
  used: Set<string>,
): DraftedField {
  const label = cleanLabel(group.leadText) || null;
  const region = unionBox(group.members.map((m) => m.det.box));
  const values = new Set<string>();
  const choices = group.members.map((m, i) => {
    const base = (m.text && cleanLabel(m.text)) || `option ${i + 1}`;
    const value = values.has(base) ? `${base} ${i + 1}` : base;
    values.add(value);
    return { value, region: toRegion(m.det.box) };
  });
  return {
    name: uniqueName((label && slugName(label)) || `choice_${index + 1}`, used),
    label,
    type: 'choice',
    className: 'checkbox',
    page,
    region: toRegion(region),
    labelBox: group.lead.box,
    labelSide: 'left',
    detectionScore: Math.min(...group.members.map((m) => m.det.score)),
    options: { multiple: false, choices },
  };
}

/** The schema as drafted, without the defaults validation adds: what the schema file holds. */
function schemaSource(pages: readonly GrayImage[], fields: readonly DraftedField[], options: DraftOptions): Record<string, unknown> {
  return {
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
}
