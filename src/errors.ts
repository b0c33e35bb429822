/**
 * An error a user can act on: one line naming the file and the problem.
 * exitCode 2 = usage or configuration (schema, model, options); 1 = a document failed.
 */
export class FormgleanError extends Error {
  readonly file: string | undefined;
  readonly exitCode: 1 | 2;

  constructor(message: string, options: { file?: string; exitCode?: 1 | 2; cause?: unknown } = {}) {
    super(options.file ? `${printable(options.file)}: ${message}` : message, { cause: options.cause });
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

/**
 * Characters that must not reach a terminal raw from a file name, a CSV cell or a library message: C0 and C1
 * controls (a newline would forge a line of output, ESC starts ANSI sequences: ECMA-48 §5), DEL, the Unicode line and
 * paragraph separators, and the bidirectional overrides and isolates that reorder what is shown (Unicode TR #9 §2).
 */
const UNPRINTABLE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

/** Text as it may be printed: each unprintable character written as an escape (\n, \t, \x1b, \u202e). */
export function printable(text: string): string {
  return text.replace(UNPRINTABLE, (ch) => {
    if (ch === '\n') return '\\n';
    if (ch === '\r') return '\\r';
    if (ch === '\t') return '\\t';
    const code = ch.charCodeAt(0);
    return code <= 0xff ? `\\x${code.toString(16).padStart(2, '0')}` : `\\u${code.toString(16).padStart(4, '0')}`;
  });
}

/**
 * Any thrown value as one printable line. formglean's own errors are escaped whole (a newline in them comes from a
 * file name or a cell); other errors keep their first line, as library messages put details on the lines below.
 */
export function oneLine(err: unknown): string {
  if (err instanceof FormgleanError) return printable(err.message.trim());
  const msg = err instanceof Error ? err.message : String(err);
  return printable(msg.split(/\r?\n/)[0].trim());
}
