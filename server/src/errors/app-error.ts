/** One field's complaint in a schema error. */
export interface FieldError {
  path: string;
  message: string;
}

/**
 * The one error type of the server: a machine code, an HTTP status and a message a person can act on. The error
 * middleware turns it into an RFC 9457 problem document; any other error becomes a 500 with no internals.
 *
 * @example
 * throw new AppError('user-not-found', 404, 'No user with id 12');
 */
export class AppError extends Error {
  override readonly name = 'AppError';
  constructor(
    readonly code: string,
    readonly status: number,
    message: string,
    readonly errors?: FieldError[],
  ) {
    super(message);
  }
}
