/**
 * Errors that reach the user. Each carries a stable `code` (for scripts and tests), a one-line
 * message that names the file and line where there is one, and a hint that says what to do.
 * The CLI prints `plumb: <message>` and the hint, never a stack trace, and maps the class to an
 * exit code: input and usage problems exit 2, anything else is an internal fault (3).
 */
export type ErrorCode =
  | 'E_USAGE'
  | 'E_INPUT'
  | 'E_PARSE'
  | 'E_FORMAT'
  | 'E_MODEL'
  | 'E_CONFIG'
  | 'E_MEMORY'
  | 'E_INTERNAL';

export interface SourcePosition {
  file: string;
  line?: number;
  column?: number;
}

export class PlumbError extends Error {
  readonly code: ErrorCode;
  readonly hint: string | undefined;
  readonly position: SourcePosition | undefined;
  /** The exit code the CLI returns for this error. */
  readonly exitCode: 2 | 3;

  constructor(code: ErrorCode, message: string, options: { hint?: string; position?: SourcePosition; cause?: unknown } = {}) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'PlumbError';
    this.code = code;
    this.hint = options.hint;
    this.position = options.position;
    this.exitCode = code === 'E_INTERNAL' || code === 'E_MEMORY' ? 3 : 2;
  }
}

/** Formats `file:line:column` as editors and CI annotations expect; omits parts that are unknown. */
export function formatPosition(position: SourcePosition): string {
  let text = position.file;
  if (position.line !== undefined) text += `:${position.line}`;
  if (position.line !== undefined && position.column !== undefined) text += `:${position.column}`;
  return text;
}

export const usageError = (message: string, hint?: string): PlumbError =>
  new PlumbError('E_USAGE', message, hint === undefined ? {} : { hint });
