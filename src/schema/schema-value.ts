/** A field entry of the form-schema file, as plain data (validated by FormSchema where it is used). */
export interface SchemaFieldValue {
  name: string;
  label: string;
  type: string;
  class: string;
  page: number;
  region: [number, number, number, number];
  required?: boolean;
  options?: Record<string, unknown>;
  ocr?: { mode: 'block' };
  /** A comb's number of boxes. */
  cells?: number;
  reviewThreshold?: number;
  confidenceMap?: [number, number][];
}

export interface SchemaValue {
  $schema: string;
  form: { name: string; version: string; description: string };
  pages: { width: number; height: number; image: string }[];
  fields: SchemaFieldValue[];
}
