import type { RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from '../errors/app-error';

// 1 MB: a profile document is a few kilobytes; the limit only keeps a wrong file from filling memory (our choice)
export const profileUploadLimitBytes = 1024 * 1024;

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: profileUploadLimitBytes, files: 1, fields: 0, parts: 1 },
}).single('file');

/** Reads a multipart body with one small file field `file` into memory; any other body passes through untouched. */
export const profileUpload: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
      return next(
        new AppError(
          'profile-file-too-large',
          413,
          `A profile file may be at most ${profileUploadLimitBytes} bytes.`,
        ),
      );
    }
    const detail = err instanceof multer.MulterError ? `${err.message}.` : 'The upload could not be read.';
    next(new AppError('profile-upload-invalid', 400, `${detail} Send one file in the field "file".`));
  });
};
