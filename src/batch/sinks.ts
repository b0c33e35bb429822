/**
 * The results folder's index moved to src/results/ (its owner); these names stay importable from here for callers
 * written against the batch module.
 */
export { documentJsonName, RESULTS_FILE, SUMMARY_FILE } from '../results/layout.js';
export { failedLine, okLine, ResultsLine } from '../results/results-line.js';
export { summarize, type BatchSummary } from '../results/summary.js';
export { writeIndex as writeBatchOutputs } from '../results/index-write.js';
