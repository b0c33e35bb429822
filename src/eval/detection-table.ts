import type { DetectorEvalReport } from './detection-run.js';
import { formatTable } from '../io/text-table.js';
import { num } from './figures.js';


/** The per-class table `detector eval` prints: AP figures, and precision/recall at the operating threshold. */
export function formatDetectorEval(report: DetectorEvalReport): string {
  const t = report.scoreThreshold;
  const header = ['class', 'labels', 'AP@0.5', 'AP@0.5:0.95', `P@${t}`, `R@${t}`, 'VOC AP', 'VOC 11-pt'];
  const rows = report.classes.map((c) => [
    c.name,
    String(c.groundTruth),
    num(c.ap50, 3),
    num(c.ap50to95, 3),
    num(c.operating.precision, 3),
    num(c.operating.recall, 3),
    num(c.vocAllPointAp50, 3),
    num(c.vocElevenPointAp50, 3),
  ]);
  rows.push(['mean', String(report.data.boxes), num(report.mean.ap50, 3), num(report.mean.ap50to95, 3), '', '', num(report.mean.vocAllPointAp50, 3), '']);
  return [
    `model ${report.model.id} (input ${report.model.inputWidth}x${report.model.inputHeight}); ` +
      `${report.data.images} images, ${report.data.boxes} labeled boxes`,
    formatTable(header, rows, { rule: true }),
    `AP: COCO 101-point interpolation (AP@0.5:0.95 averaged over IoU 0.50:0.05:0.95); VOC: all-point and 11-point at IoU 0.5; ` +
      `P/R: detections scoring >= ${t}, matched at IoU 0.5`,
    `detector time per page: median ${report.timing.msPerImageMedian.toFixed(1)} ms, p90 ${report.timing.msPerImageP90.toFixed(1)} ms`,
    '',
  ].join('\n');
}
