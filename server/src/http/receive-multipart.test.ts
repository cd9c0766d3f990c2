import multer from 'multer';
import { describe, expect, it } from 'vitest';
import { multipartProblem } from './receive-multipart';

const one = { fields: { files: 4 } };
const three = { fields: { bracket: 100, chart: 1, leader: 1 } };

describe('the problems a multipart upload answers', () => {
  it('names the limit when there are too many files, for one field or several', () => {
    expect(multipartProblem(new multer.MulterError('LIMIT_FILE_COUNT'), one)).toMatchObject({
      status: 413,
      code: 'too-many-files',
      message: 'At most 4 files per upload; nothing was kept. Send the rest in another upload.',
    });
    expect(multipartProblem(new multer.MulterError('LIMIT_UNEXPECTED_FILE', 'chart'), three)).toMatchObject({
      status: 413,
      message:
        'At most 1 files in the field "chart" per upload; nothing was kept. Send the rest in another upload.',
    });
  });

  it('names the fields to use when a file comes in another', () => {
    expect(multipartProblem(new multer.MulterError('LIMIT_UNEXPECTED_FILE', 'scan'), three)).toMatchObject({
      status: 400,
      code: 'unexpected-field',
      message: 'Send the files in the multipart field "bracket" or "chart" or "leader", not "scan".',
    });
  });

  it('gives the size limit of a file held in memory', () => {
    expect(
      multipartProblem(new multer.MulterError('LIMIT_FILE_SIZE', 'file'), {
        fields: { file: 1 },
        maxFileBytes: 1024,
      }),
    ).toMatchObject({
      status: 413,
      code: 'file-too-large',
      message: 'A file may be at most 1024 bytes; nothing was kept.',
    });
  });

  it('answers 400 for a body that is not multipart at all', () => {
    expect(multipartProblem(new Error('Unexpected end of form'), one)).toMatchObject({
      status: 400,
      code: 'upload-invalid',
      message: 'The upload could not be read; nothing was kept.',
    });
  });
});
