import type { DocumentResult } from '../result/document.js';
import { isPending } from './pending.js';

export interface ReviewCounts {
  pending: number;
  corrected: number;
  confirmed: number;
}

export interface ReviewStatus {
  total: ReviewCounts;
  /** Per field name, in order of first appearance. */
  byField: ({ field: string } & ReviewCounts)[];
  /** Per document, in id order. */
  byDocument: ({ document: string } & ReviewCounts)[];
}

function zero(): ReviewCounts {
  return { pending: 0, corrected: 0, confirmed: 0 };
}

/** Where review stands: fields still waiting, and fields a person corrected or confirmed. Pure. */
export function reviewStatus(results: readonly DocumentResult[]): ReviewStatus {
  const total = zero();
  const byField = new Map<string, ReviewCounts>();
  const byDocument = new Map<string, ReviewCounts>();
  const sorted = [...results].sort((a, b) => (a.document.id < b.document.id ? -1 : a.document.id > b.document.id ? 1 : 0));
  for (const r of sorted) {
    const d = zero();
    byDocument.set(r.document.id, d);
    for (const f of r.fields) {
      const key: keyof ReviewCounts | undefined = isPending(f.status)
        ? 'pending'
        : f.status === 'corrected' || f.status === 'confirmed'
          ? f.status
          : undefined;
      if (!byField.has(f.name)) byField.set(f.name, zero());
      if (key === undefined) continue;
      total[key]++;
      d[key]++;
      byField.get(f.name)![key]++;
    }
  }
  return {
    total,
    byField: [...byField].map(([field, c]) => ({ field, ...c })),
    byDocument: [...byDocument].map(([document, c]) => ({ document, ...c })),
  };
}
