/**
 * formglean's library surface. Everything here runs offline; nothing is sent anywhere. From the repository root
 * (test/api/doc-example.test.ts compiles and runs these lines as written):
 *
 *   const schema = await loadSchema('schemas/clinic-intake.yaml');
 *   const detector = await loadDetector(DEFAULT_MODEL_PATH);
 *   const ocr = new OcrEngine(); // one tesseract.js worker, started on the first read
 *   const digitReader = await DigitReader.open(); // optional: digit combs read cell by cell beside Tesseract
 *   const { result } = await extractDocument('samples/clinic-intake-typed.png', { schema, detector, ocr, digitReader });
 *   console.log(result.fields.filter((f) => f.status === 'accepted').length, 'fields accepted');
 *   await runBatch({ inputs: ['samples/clinic-intake-typed.png'], schemas: [schema], detector, ocr, digitReader, outDir: 'out' });
 *   await digitReader.close();
 *   await detector.close();
 *   await ocr.close();
 */
export { loadSchema, parseSchemaText, referenceImagePath } from './schema/load.js';
export { loadSchemas } from './schema/load-many.js';
export type { LoadedSchema } from './schema/load.js';
export { FormSchema, FieldSpec } from './schema/definition.js';
export { checkSchemaAgainstClasses, checkSchemaConsistency } from './schema/consistency.js';
export { formSchemaJsonSchema } from './schema/json-schema.js';
export { loadDetector } from './detect/onnx-detector.js';
export type { Detector, Detection, DetectOptions } from './detect/types.js';
export { DEFAULT_MODEL_PATH } from './models.js';
export { DigitReader, DEFAULT_DIGIT_MODEL_PATH } from './read/digit-reader.js';
export type { CellRead } from './read/digit-reader.js';
export { extractDocument, extractFile, extractForms } from './pipeline/extract-document.js';
export type { ExtractOptions, ExtractedDocument } from './pipeline/extract-document.js';
export { runBatch, runBatch as extractBatch } from './batch/run-batch.js';
export type { BatchOptions, BatchReport, DocumentEvent } from './batch/run-batch.js';
export { decodeDocument } from './input/decode.js';
export { FIELD_TYPES, getFieldType, fieldTypeNames } from './fields/registry.js';
export type { FieldType, Reading, Interpretation } from './fields/types.js';
export { DocumentResult, FieldResult, FieldStatus } from './result/document.js';
export { applyAnswers, applyReviewQueue } from './review/apply.js';
export type { Answer } from './review/apply-plan.js';
export { startReviewPage } from './review/page/server.js';
export type { ReviewPage, ReviewPageOptions } from './review/page/server.js';
export { REASONS, reasonInfo } from './fields/reasons.js';
export type { ReasonCode } from './fields/reasons.js';
export { OcrEngine } from './read/ocr-engine.js';
export { FormgleanError } from './errors.js';
