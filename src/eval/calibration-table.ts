import type { CalibrateRun } from './calibration-run.js';
import { formatTable } from '../io/text-table.js';
import { pct } from './figures.js';


/** Per-field thresholds, before and after, with what the proposal accepts on the calibration data. */
export function formatCalibration(run: CalibrateRun): string {
  const p = run.proposal;
  // "from raw": the raw confidence where acceptance starts; "threshold": the same on the mapped scale, as written.
  const header = ['field', 'type', 'fit', 'samples', 'errors', 'was', 'from raw', 'threshold', 'accepted', 'err|acc'];
  const rows = p.fields.map((f) => [
    f.field,
    f.type,
    f.scope,
    String(f.samples),
    String(f.errors),
    run.current.get(f.field)?.toFixed(4) ?? '-',
    f.threshold.toFixed(4),
    run.fields.get(f.field)!.reviewThreshold.toFixed(4),
    pct(f.acceptedShare),
    f.accepted > 0 ? pct(f.acceptedErrors / f.accepted, 2) : '-',
  ]);
  const overall =
    `${run.documents} ${run.labels === 'review' ? 'reviewed ' : ''}documents, ${p.samples} labeled fields: thresholds accept ${pct(p.samples ? p.accepted / p.samples : 0)} ` +
    `with ${p.accepted ? pct(p.acceptedErrors / p.accepted, 2) : '-'} wrong among accepted ` +
    `(target ${pct(p.targetError, 2)}; measured on the calibration data itself, so check on a held-out set)`;
  return `${formatTable(header, rows, { rule: true })}\n\n${overall}\n${run.target.message}\n`;
}
