import type { DocumentResult } from '../result/document.js';
import { isPending } from './pending.js';
import { queueMode } from './layout-question.js';

export interface ReviewCounts {
  pending: number;
  corrected: number;
  confirmed: number;
}

/** Where review stands for one form layout (schema): its documents, and only the fields that had doubtful rows. */
export interface LayoutStatus extends ReviewCounts {
  layout: string;
  documents: number;
  /** Documents with no field waiting: every field accepted, or answered by a reviewer. */
  documentsDone: number;
  /** Fields that went to review in at least one document (still waiting, corrected or confirmed), schema order. */
  fields: ({ field: string } & ReviewCounts)[];
}

export interface ReviewStatus {
  total: ReviewCounts;
  byLayout: LayoutStatus[];
  /** Documents with at least one field that went to review, in id order. */
  byDocument: ({ document: string; layout: string } & ReviewCounts)[];
  /** Documents of unknown layout whose one question (which form is this?) waits for a person; their fields are not counted. */
  layoutQuestions: string[];
  /** Documents a person said are another form (to read again with that schema) or none of the forms; their fields are not counted. */
  setAside: { document: string; decision: 'other_form' | 'not_a_form'; schema?: string }[];
}

function zero(): ReviewCounts {
  return { pending: 0, corrected: 0, confirmed: 0 };
}

function any(c: ReviewCounts): boolean {
  return c.pending + c.corrected + c.confirmed > 0;
}

/**
 * Where review stands: fields still waiting, and fields a person corrected or confirmed, grouped by the layout
 * (schema) the documents were read with; fields and documents that never needed a person are left out. Pure.
 */
export function reviewStatus(results: readonly DocumentResult[]): ReviewStatus {
  const total = zero();
  const layouts = new Map<string, LayoutStatus & { byField: Map<string, ReviewCounts> }>();
  const byDocument: ReviewStatus['byDocument'] = [];
  const layoutQuestions: string[] = [];
  const setAside: ReviewStatus['setAside'] = [];
  const sorted = [...results].sort((a, b) => (a.document.id < b.document.id ? -1 : a.document.id > b.document.id ? 1 : 0));
  for (const r of sorted) {
    const name = r.schema.name;
    let layout = layouts.get(name);
    if (!layout) {
      layout = { layout: name, documents: 0, documentsDone: 0, ...zero(), fields: [], byField: new Map() };
      layouts.set(name, layout);
    }
    layout.documents++;
    const mode = queueMode(r);
    if (mode === 'layout') {
      layoutQuestions.push(r.document.id);
      continue;
    }
    if (mode === 'none') {
      // Only an answer other than a confirmation takes a document out of the queue (layout-question.ts).
      const { decision, schema } = r.layout!.review!;
      setAside.push({ document: r.document.id, decision: decision as 'other_form' | 'not_a_form', ...(schema !== undefined ? { schema } : {}) });
      continue;
    }
    const d = zero();
    for (const f of r.fields) {
      const key: keyof ReviewCounts | undefined = isPending(f.status)
        ? 'pending'
        : f.status === 'corrected' || f.status === 'confirmed'
          ? f.status
          : undefined;
      if (key === undefined) continue;
      total[key]++;
      d[key]++;
      layout[key]++;
      if (!layout.byField.has(f.name)) layout.byField.set(f.name, zero());
      layout.byField.get(f.name)![key]++;
    }
    if (d.pending === 0) layout.documentsDone++;
    if (any(d)) byDocument.push({ document: r.document.id, layout: name, ...d });
  }
  // Fields in the order the layout's documents list them (schema order), not the order they first went to review.
  const byLayout = [...layouts.values()].map(({ byField, ...l }) => {
    const order = sorted.find((r) => r.schema.name === l.layout)!.fields.map((f) => f.name);
    const names = [...byField.keys()].sort((a, b) => order.indexOf(a) - order.indexOf(b));
    return { ...l, fields: names.map((field) => ({ field, ...byField.get(field)! })) };
  });
  byLayout.sort((a, b) => (a.layout < b.layout ? -1 : a.layout > b.layout ? 1 : 0));
  return { total, byLayout, byDocument, layoutQuestions, setAside };
}
