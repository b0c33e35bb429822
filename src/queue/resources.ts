import { loadDetector } from '../detect/onnx-detector.js';
import type { Detector } from '../detect/types.js';
import { configError } from '../errors.js';
import { DigitReader } from '../read/digit-reader.js';
import { OcrEngine } from '../read/ocr-engine.js';
import { ReferencePages } from '../pipeline/reference-pages.js';
import { checkReferenceImages } from '../schema/blank-images.js';
import { checkSchemaAgainstClasses } from '../schema/consistency.js';
import { loadSchema, type LoadedSchema } from '../schema/load.js';
import { sha256Of } from '../batch/run-batch.js';
import type { HashedFile } from './payload.js';

/** What a worker offers beside the paths a job names: files found under other paths on this machine. */
export interface Offered {
  schemas: readonly string[];
  models: readonly string[];
  digitModels: readonly string[];
  threads?: number;
}

/**
 * Schemas and models a worker has resolved, by sha256. A job names each by the path its submitter saw and the file's
 * hash; the worker takes the file with that hash from the paths it was offered (--schema, --model, --digit-model)
 * or the job's own path, and refuses the job when none has it: reading with another schema or model than the one
 * submitted would give records that disagree with the rest of the batch.
 */
export class WorkerResources {
  private readonly schemas = new Map<string, LoadedSchema>();
  /** The blanks of every schema met so far, decoded when the schema is first loaded. */
  readonly references = new ReferencePages();
  /** The OCR engine every job of this process reads with (tesseract.js serializes its reads in any case). */
  readonly ocr = new OcrEngine();
  private readonly detectors = new Map<string, Detector>();
  private readonly digitReaders = new Map<string, Promise<DigitReader>>();

  constructor(private readonly offered: Offered) {}

  private async find(what: string, want: HashedFile, offered: readonly string[], flag: string): Promise<string> {
    for (const candidate of [...offered, want.path]) {
      // Hashed afresh each time: a resolved file is kept by its hash below, so this runs once per new schema or model.
      if ((await sha256Of(candidate).catch(() => null)) === want.sha256) return candidate;
    }
    throw configError(
      want.path,
      `${what} with sha256 ${want.sha256.slice(0, 12)}... not found on this worker (no offered file has that hash); ` +
        `start the worker with ${flag} naming that exact file`,
    );
  }

  async schema(want: HashedFile): Promise<LoadedSchema> {
    const known = this.schemas.get(want.sha256);
    if (known) return known;
    const loaded = await loadSchema(await this.find('schema', want, this.offered.schemas, '--schema'));
    // Read between the hash check and the load, a file replaced then is caught here.
    if (loaded.sha256 !== want.sha256) throw configError(loaded.path, 'schema changed while it was loaded');
    const missing = await checkReferenceImages(loaded);
    if (missing.length > 0) throw configError(loaded.path, missing[0]);
    await this.references.add([loaded]);
    this.schemas.set(want.sha256, loaded);
    return loaded;
  }

  async detector(want: HashedFile): Promise<Detector> {
    const known = this.detectors.get(want.sha256);
    if (known) return known;
    const detector = await loadDetector(await this.find('model', want, this.offered.models, '--model'), { intraOpThreads: this.offered.threads });
    if (detector.sha256 !== want.sha256) throw configError(detector.path, 'model changed while it was loaded');
    this.detectors.set(want.sha256, detector);
    return detector;
  }

  async digitReader(want: HashedFile | null): Promise<DigitReader | undefined> {
    if (want === null) return undefined;
    let r = this.digitReaders.get(want.sha256);
    if (!r) {
      r = this.find('digit model', want, this.offered.digitModels, '--digit-model').then((f) => DigitReader.open(f));
      this.digitReaders.set(want.sha256, r);
      r.catch(() => this.digitReaders.delete(want.sha256));
    }
    return r;
  }

  /** The job's schemas checked against its detector's classes (the same check extract makes before a batch). */
  async checked(schemas: readonly HashedFile[], model: HashedFile): Promise<{ schemas: LoadedSchema[]; detector: Detector }> {
    const detector = await this.detector(model);
    const loaded: LoadedSchema[] = [];
    for (const s of schemas) {
      const l = await this.schema(s);
      const problems = checkSchemaAgainstClasses(l.schema, detector.classNames);
      if (problems.length > 0) throw configError(l.path, problems[0]);
      loaded.push(l);
    }
    return { schemas: loaded, detector };
  }

  async close(): Promise<void> {
    for (const d of this.detectors.values()) await d.close();
    for (const r of this.digitReaders.values()) await (await r.catch(() => null))?.close();
    await this.ocr.close();
  }
}
