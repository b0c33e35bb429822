import { formatTable } from '../io/text-table.js';
import type { Metrics, ScoreReport } from './score.js';
import { num, pct } from './figures.js';


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
    num(m.ece, 4),
  ];
}

/** A table of score figures under a ruled header: the title heads the first column, then COLUMNS. */
function scoreTable(title: string, rows: string[][]): string {
  return formatTable([title, ...COLUMNS], rows, { rule: true });
}

function section(title: string, groups: Record<string, Metrics>): string {
  return scoreTable(title, Object.entries(groups).map(([k, m]) => row(k, m)));
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
    scoreTable('overall', [row('all fields', report.overall)]),
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
