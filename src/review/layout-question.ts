import type { DocumentResult, LayoutDecision, LayoutReview } from '../result/document.js';
import type { LoadedSchema } from '../schema/load.js';

/**
 * A document whose layout is unknown (no schema fitted its first page) asks a person one question before any of
 * its fields: which form is this? The review queue holds one row for it, not one per field, under this pseudo field
 * name (never a schema field name: those are lower-case slugs) and type.
 */
export const LAYOUT_ROW_FIELD = '(layout)';
export const LAYOUT_ROW_TYPE = 'layout';

/** The answer that says the page is none of the forms it was compared with. */
export const NOT_A_FORM_ANSWER = '(none)';

/** What the review queue lists for a document: its layout question, its doubtful fields, or nothing (set aside). */
export type QueueMode = 'layout' | 'fields' | 'none';

export function queueMode(doc: DocumentResult): QueueMode {
  const layout = doc.layout;
  if (layout?.review) return layout.review.decision === 'confirmed' || readAsNamed(doc) ? 'fields' : 'none';
  return layout?.status === 'unknown_layout' ? 'layout' : 'fields';
}

/** A document a person said is another form, since read again with that form's schema. */
function readAsNamed(doc: DocumentResult): boolean {
  const review = doc.layout?.review;
  return review?.decision === 'other_form' && review.schema === doc.schema.name;
}

/** A person said this document is another form, and it has not been read with that form's schema yet. */
export function awaitsRereading(doc: DocumentResult): boolean {
  return doc.layout?.review?.decision === 'other_form' && !readAsNamed(doc);
}

/**
 * The schema an input is to be read with again, and the answer that says so: when its one earlier record was set
 * aside as another form that is among the schemas of this run. A stack of several forms is read as usual.
 */
export function rereadAs(earlier: readonly DocumentResult[], schemas: readonly LoadedSchema[]): { schema: LoadedSchema; review: LayoutReview } | null {
  if (earlier.length !== 1 || !awaitsRereading(earlier[0])) return null;
  const review = earlier[0].layout!.review!;
  const schema = schemas.find((s) => s.schema.form.name === review.schema);
  return schema ? { schema, review } : null;
}

/** Whether the document has a layout row (asked now, or answered and open to undoing on the review page). */
export function hasLayoutRow(doc: DocumentResult): boolean {
  return doc.layout?.status === 'unknown_layout' || doc.layout?.review !== undefined;
}

/** The forms a reviewer may name: every schema the page was compared with, best fit first. */
export function layoutChoices(doc: DocumentResult): string[] {
  const names = [...(doc.layout?.candidates ?? [])].sort((a, b) => b.score - a.score).map((c) => c.schema);
  return names.includes(doc.schema.name) ? names : [doc.schema.name, ...names];
}

/** The candidates and their fit scores as one cell ("marina-slip 0.41; garden-plot 0.32"). */
export function candidatesCell(doc: DocumentResult): string {
  return [...(doc.layout?.candidates ?? [])]
    .sort((a, b) => b.score - a.score)
    .map((c) => `${c.schema} ${c.score.toFixed(2)}`)
    .join('; ');
}

/** What a reviewer may type in the layout row, for messages and the review page. */
export function layoutAcceptedInput(doc: DocumentResult): string {
  return `the name of the form this is (${layoutChoices(doc).join(', ')}), or ${NOT_A_FORM_ANSWER} when it is none of them`;
}

type Answered = { decision: LayoutDecision; schema?: string };

/**
 * A layout answer as the queue row's value, in the audit log and on the review page: the form the document is
 * (the one it was read as when confirmed), or null for none of them.
 */
export function layoutAnswerValue(doc: DocumentResult, answer: Answered): string | null {
  return answer.decision === 'not_a_form' ? null : (answer.schema ?? doc.schema.name);
}

/** A layout answer as a field status: a confirmation, or a correction (another form, or none). */
export function layoutAnswerStatus(answer: Answered): 'confirmed' | 'corrected' {
  return answer.decision === 'confirmed' ? 'confirmed' : 'corrected';
}

export type LayoutAnswer = { decision: LayoutDecision; schema?: string } | { problem: string };

/**
 * A layout row's answer: confirming (or typing the form it was read as) says the reading stands; another form's
 * name says to read it again with that schema; (none) sets it aside. Never quotes the typed text in a problem.
 */
export function parseLayoutAnswer(doc: DocumentResult, answer: { kind: 'confirm' } | { kind: 'correct'; text: string }): LayoutAnswer {
  if (answer.kind === 'confirm') return { decision: 'confirmed' };
  const text = answer.text.trim().toLowerCase();
  if (text === NOT_A_FORM_ANSWER) return { decision: 'not_a_form' };
  if (text === doc.schema.name.toLowerCase()) return { decision: 'confirmed' };
  const other = layoutChoices(doc).find((n) => n.toLowerCase() === text);
  if (other !== undefined) return { decision: 'other_form', schema: other };
  return { problem: `the layout of document "${doc.document.id}" must be ${layoutAcceptedInput(doc)}; not applied` };
}
