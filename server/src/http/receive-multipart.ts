import type { Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import { AppError } from '../errors/app-error';

/** What a multipart route accepts, to word its refusals. */
export interface MultipartExpectation {
  /** The file fields the route reads, each with the most files it takes. */
  fields: Readonly<Record<string, number>>;
  /** The largest file, in bytes, where multer itself enforces it (memory storage). */
  maxFileBytes?: number;
}

const quoted = (names: readonly string[]) => names.map((n) => `"${n}"`).join(' or ');

/**
 * The problem a multer failure answers, in one wording for every upload: too many files (413), a file field the
 * route does not read (400), a file over the size limit (413), anything else unreadable (400). Each says nothing
 * was kept, which holds: multer removes what it wrote when it fails.
 */
export function multipartProblem(err: unknown, expected: MultipartExpectation): AppError {
  const names = Object.keys(expected.fields);
  if (!(err instanceof multer.MulterError)) {
    return new AppError('upload-invalid', 400, 'The upload could not be read; nothing was kept.');
  }
  const field = err.field ?? '';
  const tooMany =
    err.code === 'LIMIT_FILE_COUNT' || (err.code === 'LIMIT_UNEXPECTED_FILE' && names.includes(field));
  if (tooMany) {
    const most = names.includes(field)
      ? expected.fields[field]!
      : Math.max(...Object.values(expected.fields));
    const where = names.length > 1 && names.includes(field) ? ` in the field "${field}"` : '';
    return new AppError(
      'too-many-files',
      413,
      `At most ${most} files${where} per upload; nothing was kept. Send the rest in another upload.`,
    );
  }
  if (err.code === 'LIMIT_UNEXPECTED_FILE') {
    return new AppError(
      'unexpected-field',
      400,
      `Send the files in the multipart field ${quoted(names)}, not "${field}".`,
    );
  }
  if (err.code === 'LIMIT_FILE_SIZE') {
    return new AppError(
      'file-too-large',
      413,
      `A file may be at most ${expected.maxFileBytes ?? 0} bytes; nothing was kept.`,
    );
  }
  return new AppError(
    'upload-invalid',
    400,
    `${err.message}${field ? ` (field "${field}")` : ''}; nothing was kept.`,
  );
}

/**
 * Runs a multer handler on the request and resolves once the body is read; a failure rejects with the problem
 * `multipartProblem` words.
 *
 * @example
 * await receiveMultipart(upload.array('files', 100), req, res, { fields: { files: 100 } });
 */
export function receiveMultipart(
  handler: RequestHandler,
  req: Request,
  res: Response,
  expected: MultipartExpectation,
): Promise<void> {
  return new Promise((resolve, reject) =>
    handler(req, res, (err?: unknown) => (err ? reject(multipartProblem(err, expected)) : resolve())),
  );
}
