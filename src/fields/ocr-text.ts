import type { Reading } from './types.js';

/** Collapse whitespace and strip stray edge punctuation that OCR produces from borders (common practice). */
export function cleanOcrText(raw: string): string {
  return raw
    .replace(/[\u2018\u2019]/g, "'")
    .replace(/[\u201c\u201d]/g, '"')
    .replace(/\s+/g, ' ')
    .replace(/^[\s|\]\[_~`.,;:!'"-]+/, '')
    .replace(/[\s|\]\[_~`,;:!'"-]+$/, '')
    .trim();
}

/** The cleaned OCR text of a reading; types read by OCR call this and so reject mark or ink readings loudly. */
export function ocrText(reading: Reading, typeName: string): string {
  if (reading.kind !== 'text') throw new Error(`${typeName} fields are read by OCR, got a ${reading.kind} reading`);
  return cleanOcrText(reading.text);
}
