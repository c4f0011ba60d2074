import { errorKind, errorMessage, type ErrorCode, type ErrorKind, type ErrorParams } from './catalogue';

/** Facts a program can act on without reading the message: file, line, field(s), limits, ids. */
export type ErrorDetails = Record<string, unknown>;

/** The arguments after the code: its message parameters (optional when it takes none), details, cause. */
export type AppErrorArgs<C extends ErrorCode> = undefined extends ErrorParams<C>
  ? [params?: ErrorParams<C>, details?: ErrorDetails, options?: { cause?: unknown }]
  : [params: ErrorParams<C>, details?: ErrorDetails, options?: { cause?: unknown }];

/**
 * The one error Sluice throws, in the core and on the server. `code` is permanent and names
 * the message in `ERROR_CATALOGUE`; `kind` says what sort of failure it is, which the HTTP
 * layer turns into a status (`toResponse`). Classes of the core that carry more (the sweep
 * parser's location, a bin plan's issues) extend it.
 */
export class AppError<C extends ErrorCode = ErrorCode> extends Error {
  readonly code: C;
  readonly kind: ErrorKind;
  readonly details: ErrorDetails | undefined;

  constructor(code: C, ...[params, details, options]: AppErrorArgs<C>) {
    super(errorMessage(code, params as ErrorParams<C>), options);
    this.name = 'AppError';
    this.code = code;
    this.kind = errorKind(code);
    this.details = details;
  }
}

export function isAppError(value: unknown): value is AppError {
  return value instanceof AppError;
}
