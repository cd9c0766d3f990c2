import type { RequestHandler } from 'express';
import multer from 'multer';
import { receiveMultipart } from '../http/receive-multipart';

// 1 MB: a profile document is a few kilobytes; the limit only keeps a wrong file from filling memory (our choice)
export const profileUploadLimitBytes = 1024 * 1024;

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: profileUploadLimitBytes, files: 1, fields: 0, parts: 1 },
}).single('file');

/** Reads a multipart body with one small file field `file` into memory; any other body passes through untouched. */
export const profileUpload: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  receiveMultipart(upload, req, res, { fields: { file: 1 }, maxFileBytes: profileUploadLimitBytes }).then(
    () => next(),
    next,
  );
};
