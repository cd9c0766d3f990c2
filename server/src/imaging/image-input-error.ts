/** Why a file could not be read as a negative scan. */
export type ImageInputErrorCode =
  | 'missing'
  | 'empty'
  | 'not-an-image'
  | 'truncated'
  | 'unsupported-format'
  | 'too-many-pixels'
  | 'unsupported-depth'
  | 'not-colour';

/**
 * The one error `readNegative` throws for a file it will not decode. `message` is written for the
 * person who uploaded the file; `code` is stable and meant for programs.
 *
 * @example
 *   try { await readNegative(path) } catch (e) { if (e instanceof ImageInputError && e.code === 'truncated') ... }
 */
export class ImageInputError extends Error {
  override readonly name = 'ImageInputError';
  readonly code: ImageInputErrorCode;

  constructor(code: ImageInputErrorCode, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.code = code;
  }
}
