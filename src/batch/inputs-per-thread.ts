/**
 * Inputs one thread reads at once. tesseract.js recognizes in a thread of its own, so while one input waits on OCR
 * the thread decodes, levels, registers and crops the next: two in flight keep both busy (bench/batch-speed.ts, 1
 * worker, with and without). More than two adds memory (each holds its pages) and no speed, since OCR calls queue on
 * the one tesseract worker anyway. Each input's record is the same whatever else is in flight: every stage is pure but
 * OCR, whose calls are serialized with their parameters (src/read/ocr-engine.ts).
 */
export const INPUTS_PER_THREAD = 2;
