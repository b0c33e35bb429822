/**
 * Columns of review/queue.csv, in the order written. The reader finds them by header name, so a reviewer
 * may reorder them or add columns of their own.
 *  row_id        stable id of the row (hash of the document's content hash and the field name)
 *  document      document id (the input file's name without extension)
 *  result_hash   fingerprint of the document's result JSON at export; apply refuses rows whose JSON changed since
 *  page          page number, 1 = first page
 *  field, type   schema field name and field type
 *  status        field status at export (review, missing or invalid)
 *  value         the normalized value as read ('' when nothing usable was read)
 *  raw           what was read before normalization (the record's "raw"; older queues call it ocr_text)
 *  confidence    0..1
 *  reasons       reason codes, separated by "; "
 *  crop          field image, relative to queue.csv
 *  context_crop  the field with its surroundings, framed, relative to queue.csv
 *  correction    reviewer: the right value, typed as on the form (checked like OCR output)
 *  confirm       reviewer: yes when the value as read is right
 *  note          reviewer: free text kept in the result and the audit log
 */
export const QUEUE_COLUMNS = [
  'row_id',
  'document',
  'result_hash',
  'page',
  'field',
  'type',
  'status',
  'value',
  'raw',
  'confidence',
  'reasons',
  'crop',
  'context_crop',
  'correction',
  'confirm',
  'note',
] as const;

export type QueueColumn = (typeof QUEUE_COLUMNS)[number];
export type QueueRow = Record<QueueColumn, string>;

/** Columns the reviewer fills in. */
export const REVIEWER_COLUMNS = ['correction', 'confirm', 'note'] as const satisfies readonly QueueColumn[];

/** Columns apply cannot work without. */
export const REQUIRED_COLUMNS = ['row_id', 'result_hash', 'correction', 'confirm'] as const satisfies readonly QueueColumn[];

/** Separator between reason codes in the reasons cell. */
export const REASON_SEPARATOR = '; ';
