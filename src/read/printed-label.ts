import { distance } from 'fastest-levenshtein';
import type { OcrWord, TextReading } from '../fields/types.js';

/**
 * Printed label text caught in a crop. Where a label sits inside or right next to its entry area (ruled cells with
 * the label in the corner, captions under a line), a crop of a blank field reads as the label ("City") and a filled
 * one as the label plus the value. When the read starts or ends with the field's printed label (as the schema
 * gives it) those words are dropped. Words match after case folding and removal of punctuation; a word of four or
 * more characters may differ by one edit (a common OCR slip). Labels shorter than four characters in all are left
 * alone: "No." could as well be the value.
 */
const MIN_LABEL_CHARS = 4;

function norm(s: string): string {
  return s.toLowerCase().replace(/[^\p{L}\p{N}]/gu, '');
}

function same(word: string, label: string): boolean {
  return word === label || (label.length >= 4 && distance(word, label) <= 1);
}

function matchesAt(words: readonly string[], label: readonly string[], start: number): boolean {
  if (start < 0 || start + label.length > words.length) return false;
  return label.every((l, k) => same(words[start + k], l));
}

export function withoutPrintedLabel(reading: TextReading, label: string | undefined): TextReading {
  if (!label) return reading;
  const labelWords = label.split(/\s+/).map(norm).filter(Boolean);
  if (labelWords.join('').length < MIN_LABEL_CHARS) return reading;
  const words: OcrWord[] = reading.words.length
    ? reading.words
    : reading.text.split(/\s+/).filter(Boolean).map((text) => ({ text, confidence: reading.confidence }));
  // Punctuation-only words ("(", "|") neither match nor separate the label's words.
  const kept = words.filter((w) => norm(w.text) !== '');
  const normed = kept.map((w) => norm(w.text));
  let from = 0;
  let to = kept.length;
  if (matchesAt(normed, labelWords, 0)) from = labelWords.length;
  else if (matchesAt(normed, labelWords, kept.length - labelWords.length)) to = kept.length - labelWords.length;
  else return reading;
  const rest = kept.slice(from, to);
  return {
    ...reading,
    text: rest.map((w) => w.text).join(' '),
    words: rest,
    confidence: rest.length ? rest.reduce((a, w) => a + w.confidence, 0) / rest.length : reading.confidence,
  };
}
