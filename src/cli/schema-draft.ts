import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Command } from 'commander';
import { loadDetector } from '../detect/onnx-detector.js';
import type { Detection } from '../detect/types.js';
import { configError } from '../errors.js';
import { decodeDocument } from '../input/decode.js';
import { isPdf } from '../input/pdf.js';
import { UNSURE_TEXT, unsureFields } from '../draft/unsure.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { DEFAULT_MODEL_PATH } from '../models.js';
import { normalizePage } from '../page/normalize.js';
import type { OverlayItem } from '../page/overlay.js';
import { renderOverlay } from '../page/overlay.js';
import type { GrayImage } from '../image/raster.js';
import { grayToPng } from '../image/raster.js';
import { OcrEngine } from '../read/ocr-engine.js';
import type { DraftedField, SchemaDraft } from '../draft/drafted-field.js';
import { draftSchema } from '../draft/from-image.js';
import type { SchemaValue } from '../schema/schema-value.js';
import { schemaYaml } from '../schema/yaml-write.js';

/** Frame colours of drafted fields by detector class (Okabe & Ito colour-blind-safe set). */
const CLASS_COLOURS: Record<string, string> = {
  text_entry: '#0072B2',
  checkbox: '#009E73',
  signature_area: '#CC79A7',
  comb_field: '#D55E00',
};

interface DraftFlags {
  out: string;
  model: string;
  overlay?: string;
  name?: string;
  minScore?: string;
  fromImage?: boolean;
  normalize: boolean;
}

/** Lines listing the drafted fields a person must check, at most `max` of them (the rest counted). */
export function unsureLines(items: readonly { where: string; reasons: string[] }[], max = 40): string[] {
  if (items.length === 0) return [];
  const lines = [`${items.length} field(s) to check:`];
  for (const it of items.slice(0, max)) lines.push(`  ${it.where}: ${it.reasons.join('; ')}`);
  if (items.length > max) lines.push(`  ... and ${items.length - max} more (framed on the overlay)`);
  return lines;
}

/** A drafted field's place, for the check list: name, type and region on its page. */
function placeOf(f: { name: string; type: string; page: number; region: readonly number[] }): string {
  const [x, y, w, h] = f.region;
  return `${f.name} (${f.type}, page ${f.page + 1} at ${x},${y} ${w}x${h})`;
}

/**
 * A fillable PDF is drafted from its widgets (`schema from-pdf`'s path), whose places and kinds are exact, rather
 * than from the printed page. Returns false (nothing written) when the file is not a PDF or its first page has no
 * fillable widgets.
 */
async function draftPdfWidgets(input: string, flags: DraftFlags): Promise<boolean> {
  // A file that cannot be read is left to the image decoder, whose one-line errors every input shares.
  const head = await readFile(input).catch(() => null);
  if (!head || !isPdf(head)) return false;
  // Loaded on use: the PDF library is large, and image drafting starts without it.
  const { loadPdf, readPageWidgets } = await import('../draft/from-pdf/widgets.js');
  const doc = await loadPdf(head, input);
  if (readPageWidgets(doc, 0, input).widgets.length === 0) return false;
  const { blankImageName, draftFromPdf, writePdfSchema } = await import('../draft/from-pdf/from-pdf.js');
  const { isMeaningfulName } = await import('../draft/from-pdf/naming.js');
  const draft = await draftFromPdf(input, { page: 0, image: blankImageName(flags.out), name: flags.name, bytes: head });
  const written = await writePdfSchema(draft, flags.out);
  process.stdout.write(
    `${input}: a fillable PDF; drafted from the ${draft.schema.fields.length} form fields of page 1 (as \`schema from-pdf\` does; ` +
      `--from-image drafts from the printed page instead): wrote ${written.schema} and ${written.blank}\n`,
  );
  // A field named only by its authoring tool's code ("f1_01") has no words for a person to recognize it by.
  const unsure = draft.schema.fields
    .filter((f) => !isMeaningfulName(f.name))
    .map((f) => ({ where: placeOf(f), reasons: ['the PDF gives no readable name or tooltip: name it'] }));
  for (const line of unsureLines(unsure)) process.stdout.write(`${line}\n`);
  return true;
}

/** The drafted fields of one page as overlay items: fields framed by class, their labels in thin gray. */
export function draftOverlayItems(fields: readonly DraftedField[], page: number): OverlayItem[] {
  const items: OverlayItem[] = [];
  for (const f of fields.filter((x) => x.page === page)) {
    const [x, y, w, h] = f.region;
    items.push({ box: { x, y, w, h }, colour: CLASS_COLOURS[f.className] ?? '#404040', caption: `${f.name} (${f.type})` });
    if (f.labelBox) items.push({ box: f.labelBox, colour: '#9A9A9A', caption: '', dashed: true });
  }
  return items;
}

function stemOf(out: string): string {
  return path.join(path.dirname(out), path.basename(out).replace(/\.(ya?ml|json)$/i, ''));
}

/**
 * The reference image each drafted page names. A single page used as it is points at the input file itself;
 * a page that was turned or deskewed, or one page of several, is written beside the draft as PNG, since regions
 * are only meaningful on the exact raster they were drawn on.
 */
async function referenceImages(input: string, out: string, pages: GrayImage[], changed: boolean[]): Promise<{ names: string[]; written: string[] }> {
  const dir = path.dirname(path.resolve(out));
  const names: string[] = [];
  const written: string[] = [];
  for (let i = 0; i < pages.length; i++) {
    if (pages.length === 1 && !changed[i]) {
      names.push(path.relative(dir, path.resolve(input)).split(path.sep).join('/'));
      continue;
    }
    const file = `${stemOf(out)}.page${i + 1}.png`;
    await writeFileAtomic(file, await grayToPng(pages[i], 6));
    written.push(file);
    names.push(path.relative(dir, path.resolve(file)).split(path.sep).join('/'));
  }
  return { names, written };
}

function summary(draft: SchemaDraft): string {
  const byType = new Map<string, number>();
  for (const f of draft.fields) byType.set(f.type, (byType.get(f.type) ?? 0) + 1);
  const types = [...byType.entries()].map(([t, n]) => `${n} ${t}`).join(', ');
  const unlabelled = draft.fields.filter((f) => !f.label).length;
  return `${draft.fields.length} fields (${types})${unlabelled ? `; ${unlabelled} without a label` : ''}`;
}

/** `formglean schema draft BLANK_FORM --out draft.yaml`: a first schema for a new form, to edit by hand. */
export function addDraftSubcommand(schemaCommand: Command): void {
  schemaCommand
    .command('draft')
    .description('Draft a schema from a blank form: detect entry areas, read their labels, guess names and types')
    .argument('<blank-form>', 'blank form: image (png, jpeg or tiff; one page per tiff page) or PDF (a fillable one is drafted from its form fields)')
    .requiredOption('--out <file>', 'schema file to write (YAML)')
    .option('--model <file>', 'ONNX form-element detector', DEFAULT_MODEL_PATH)
    .option('--overlay <png>', 'overlay of the drafted fields to check by eye (default: <out>.overlay.png; page 1)')
    .option('--name <name>', 'form name written into the schema (default: the input file name)')
    .option('--min-score <s>', 'lowest detection score drafted (default: the model\'s operating threshold)')
    .option('--from-image', 'draft a fillable PDF from its printed page too, not from its form fields')
    .option('--no-normalize', 'take the pages as they are (upright and level), without turning or deskewing them')
    .action(async (input: string, flags: DraftFlags) => {
      const minScore = flags.minScore === undefined ? undefined : Number(flags.minScore);
      if (minScore !== undefined && !(minScore >= 0 && minScore <= 1)) {
        throw configError(undefined, `--min-score must be a number from 0 to 1; got "${flags.minScore}"`);
      }
      if (!flags.fromImage && (await draftPdfWidgets(input, flags))) return;
      const detector = await loadDetector(flags.model);
      const pages: GrayImage[] = [];
      const changed: boolean[] = [];
      const detections: Detection[][] = [];
      try {
        const doc = await decodeDocument(input);
        for (const page of doc.pages) {
          // A blank rendered from a PDF is upright already; dense capitals can fool the orientation check.
          const n = flags.normalize ? normalizePage(page) : { image: page, transform: { a: 1, b: 0, c: 0, d: 0, e: 1, f: 0 } };
          pages.push(n.image);
          const t = n.transform;
          changed.push(!(t.a === 1 && t.b === 0 && t.c === 0 && t.d === 0 && t.e === 1 && t.f === 0));
          detections.push(await detector.detect(n.image, minScore === undefined ? undefined : { scoreThreshold: minScore }));
        }
      } finally {
        // The detector is this command's, as the OCR engine below is: closed when its part is done.
        await detector.close();
      }
      const refs = await referenceImages(input, flags.out, pages, changed);
      const formName = flags.name ?? path.basename(input).replace(/\.[^.]+$/, '');
      const ocr = new OcrEngine();
      let draft: SchemaDraft;
      try {
        draft = await draftSchema(pages, detections, async (crop) => (await ocr.read(crop, { mode: 'line' })).text, {
          formName,
          description: `Drafted from ${path.basename(input)}: check names, types and regions`,
          referenceImages: refs.names,
        });
      } finally {
        await ocr.close();
      }
      const header =
        `# Drafted by formglean schema draft from ${path.basename(input)} with ${path.basename(flags.model)}.\n` +
        '# Names come from the printed labels and types are guesses: read every field before use.\n';
      await writeFileAtomic(flags.out, header + schemaYaml(draft.source as unknown as SchemaValue));
      const overlay = flags.overlay ?? `${stemOf(flags.out)}.overlay.png`;
      await writeFileAtomic(overlay, await renderOverlay(pages[0], draftOverlayItems(draft.fields, 0)));
      const extra = refs.written.length ? `, reference page(s) ${refs.written.join(', ')}` : '';
      process.stdout.write(`${flags.out}: ${summary(draft)}; overlay ${overlay}${extra}\n`);
      const unsure = unsureFields(draft.fields).map((u) => ({ where: placeOf(u.field), reasons: u.reasons.map((r) => UNSURE_TEXT[r]) }));
      for (const line of unsureLines(unsure)) process.stdout.write(`${line}\n`);
    });
}
