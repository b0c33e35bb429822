/**
 * An error a user can act on: one line naming the file and the problem.
 * exitCode 2 = usage or configuration (schema, model, options); 1 = a document failed.
 */
export class FormgleanError extends Error {
  readonly file: string | undefined;
  readonly exitCode: 1 | 2;

  constructor(message: string, options: { file?: string; exitCode?: 1 | 2; cause?: unknown } = {}) {
    super(options.file ? `${options.file}: ${message}` : message, { cause: options.cause });
    this.name = 'FormgleanError';
    this.file = options.file;
    this.exitCode = options.exitCode ?? 1;
  }
}

/** Configuration problems (bad schema, model, options): exit code 2. */
export function configError(file: string | undefined, message: string, cause?: unknown): FormgleanError {
  return new FormgleanError(message, { file, exitCode: 2, cause });
}

/** A document that cannot be processed: exit code 1, the batch goes on. */
export function documentError(file: string, message: string, cause?: unknown): FormgleanError {
  return new FormgleanError(message, { file, exitCode: 1, cause });
}

/** First line of any thrown value, for one-line reports. */
export function oneLine(err: unknown): string {
  const msg = err instanceof Error ? err.message : String(err);
  return msg.split(/\r?\n/)[0].trim();
}
