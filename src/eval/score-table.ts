import type { Metrics, ScoreReport } from './score.js';

const pct = (v: number | null, digits = 1): string => (v === null ? '-' : `${(v * 100).toFixed(digits)}%`);
const num = (v: number | null, digits = 4): string => (v === null ? '-' : v.toFixed(digits));

const COLUMNS = ['fields', 'exact', 'CER', 'raw CER', 'marks', 'located', 'straight', 'err|acc', 'caught', 'slipped', 'ECE'];

function row(label: string, m: Metrics): string[] {
  return [
    label,
    String(m.fields),
    pct(m.exactMatch, 2),
    pct(m.cer, 2),
    pct(m.rawCer, 2),
    pct(m.markAccuracy, 2),
    pct(m.locationRecall),
    pct(m.straightThrough),
    pct(m.errorAmongAccepted, 2),
    String(m.caughtByReview),
    String(m.slippedThrough),
    num(m.ece),
  ];
}

/** Plain-text table with right-aligned figures; first column left-aligned. */
export function formatRows(header: string[], rows: string[][]): string {
  const all = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...all.map((r) => r[c].length)));
  const line = (r: string[]): string =>
    r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join('  ');
  return [line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}

export function formatTable(title: string, rows: string[][]): string {
  return formatRows([title, ...COLUMNS], rows);
}

function section(title: string, groups: Record<string, Metrics>): string {
  return formatTable(title, Object.entries(groups).map(([k, m]) => row(k, m)));
}

/**
 * The score as text: overall, per fill style, per fill style and type, per layout, and (when asked) per field.
 * Figures only; no field values are printed.
 */
export function formatScore(report: ScoreReport, options: { perField?: boolean } = {}): string {
  const d = report.documents;
  const parts = [
    `documents: ${d.truth} with truth, ${d.scored} scored, ${d.withoutResult} without result` +
      (d.failed ? ` (${d.failed} failed in extract)` : '') +
      (d.resultsWithoutTruth ? `, ${d.resultsWithoutTruth} results without truth (ignored)` : '') +
      `; fields: ${report.fields.scored}` +
      (report.fields.extraInResults ? ` (+${report.fields.extraInResults} result fields not in truth)` : ''),
    formatTable('overall', [row('all fields', report.overall)]),
    section('fill', report.byFill),
    section('fill/type', report.byFillType),
    section('layout', report.byLayout),
  ];
  if (options.perField) parts.push(section('layout/field', report.byField));
  parts.push(
    'exact: normalized value matches; CER: character error rate (edits / true length); marks: tick decisions ' +
      '(checkboxes, boxes of choice groups) read right; located: box IoU >= 0.5; ' +
      'straight: accepted without review; err|acc: wrong among accepted; caught/slipped: wrong values sent to review / ' +
      `accepted; ECE: expected calibration error, ${report.bins} bins (Guo et al. 2017)`,
  );
  return parts.join('\n\n') + '\n';
}
