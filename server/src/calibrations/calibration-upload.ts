import { createCalibrationRequestSchema, type CreateCalibrationRequest } from '@clearbase/contracts';
import type { Request, Response } from 'express';
import multer from 'multer';
import { AppError, type FieldError } from '../errors/app-error';
import type { FileStore } from '../files/file-store';
import { receiveMultipart } from '../http/receive-multipart';
import { hashingDiskStorage, type HashedUpload } from '../uploads/hashing-disk-storage';
import { framePath, type CalibrationUpload } from './fit-calibration-roll';

/** The multipart fields of a new calibration: files and the JSON of marks and stops. */
export const calibrationFields = {
  bracket: 'bracket',
  chart: 'chart',
  leader: 'leader',
  json: 'calibration',
} as const;
/** Most grey frames in one calibration (the request schema's limit). */
const maxBracketFrames = 100;

type StoredFile = Express.Multer.File & HashedUpload;

/** A calibration's upload as received: its request and its frames in bracket, chart, leader order. */
export interface ReceivedCalibration {
  request: CreateCalibrationRequest;
  uploads: (CalibrationUpload & { file: HashedUpload })[];
}

function parseRequest(raw: unknown): CreateCalibrationRequest {
  let json: unknown;
  try {
    json = typeof raw === 'string' ? JSON.parse(raw) : undefined;
  } catch {
    json = undefined;
  }
  if (json === undefined) {
    throw new AppError(
      'invalid-request',
      400,
      `Send the stops and marks as JSON in the multipart field "${calibrationFields.json}".`,
      [{ path: calibrationFields.json, message: 'missing or not JSON' }],
    );
  }
  const parsed = createCalibrationRequestSchema.safeParse(json);
  if (parsed.success) return parsed.data;
  const errors: FieldError[] = parsed.error.issues.map((issue) => ({
    path: issue.path
      .map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i ? '.' : ''}${String(p)}`))
      .join(''),
    message: issue.message,
  }));
  throw new AppError('invalid-request', 422, 'Some fields are missing or invalid.', errors);
}

/** The frames of a request in the order the fit reads them, each with its stored file. */
function framesOf(request: CreateCalibrationRequest, files: Record<string, StoredFile[]>) {
  const brackets = files[calibrationFields.bracket] ?? [];
  const chart = files[calibrationFields.chart]?.[0];
  const leader = files[calibrationFields.leader]?.[0];
  const missing: FieldError[] = [];
  if (brackets.length !== request.bracket.length) {
    missing.push({
      path: 'bracket',
      message: `${request.bracket.length} grey frames are described but ${brackets.length} files were sent; send one file per entry, in the same order`,
    });
  }
  if (!chart) missing.push({ path: 'chart', message: 'send the chart frame in the field "chart"' });
  if (missing.length) {
    throw new AppError('calibration-frames-missing', 422, 'Frames are missing from the upload.', missing);
  }
  const upload = (role: CalibrationUpload['role'], index: number, f: StoredFile) => ({
    role,
    index,
    path: f.path,
    fileName: f.originalname,
    file: f,
  });
  return [
    ...brackets.map((f, index) => upload('bracket', index, f)),
    upload('chart', 0, chart!),
    ...(leader ? [upload('leader', 0, leader)] : []),
  ];
}

/**
 * Reads calibration uploads (grey bracket files, the chart, an optional leader and the JSON of stops and marks) and
 * single scans to preview, streaming each file to the store's temporary folder with its hash. Whatever a request
 * leaves behind is the caller's to remove with `discard`.
 */
export function createCalibrationUpload(
  store: FileStore,
  limits: { maxFiles: number; maxFileBytes: number },
) {
  const { maxFiles, maxFileBytes } = limits;
  const upload = multer({
    storage: hashingDiskStorage({ tempPath: () => store.tempPath(), maxFileBytes }),
    // the marks and stops travel as one JSON field; 1 MB is ample (our choice)
    limits: { files: Math.min(maxFiles, maxBracketFrames + 2), fields: 4, fieldSize: 1024 * 1024 },
    defParamCharset: 'utf8',
  } as multer.Options);
  const fields = {
    [calibrationFields.bracket]: maxBracketFrames,
    [calibrationFields.chart]: 1,
    [calibrationFields.leader]: 1,
  };
  const calibration = upload.fields(Object.entries(fields).map(([name, maxCount]) => ({ name, maxCount })));
  const single = upload.single('file');

  return {
    /**
     * Receives a calibration's upload and checks it: the JSON is valid, there is one file per grey frame described
     * and a chart, and no file is over the size limit. Throws the problem otherwise; the files stay for `discard`.
     */
    async receive(req: Request, res: Response): Promise<ReceivedCalibration> {
      await receiveMultipart(calibration, req, res, { fields });
      const request = parseRequest(
        (req.body as Record<string, unknown> | undefined)?.[calibrationFields.json],
      );
      const uploads = framesOf(request, (req.files ?? {}) as Record<string, StoredFile[]>);
      const tooLarge = uploads.filter((u) => u.file.tooLarge);
      if (tooLarge.length) {
        throw new AppError(
          'file-too-large',
          413,
          `Frames larger than the limit of ${maxFileBytes} bytes; nothing was kept.`,
          tooLarge.map((u) => ({
            path: framePath(u),
            message: `${u.fileName} is larger than ${maxFileBytes} bytes`,
          })),
        );
      }
      return { request, uploads };
    },

    /** Receives one scan in the field "file", within the size limit. */
    async receiveScan(req: Request, res: Response): Promise<StoredFile> {
      await receiveMultipart(single, req, res, { fields: { file: 1 } });
      const file = req.file as StoredFile | undefined;
      if (!file)
        throw new AppError('no-files', 400, 'Send one scan as multipart/form-data in the field "file".');
      if (file.tooLarge) {
        throw new AppError(
          'file-too-large',
          413,
          `The file is larger than the limit of ${maxFileBytes} bytes.`,
        );
      }
      return file;
    },

    /** Every file this request's upload wrote, to remove once the request is answered. */
    filesOf(req: Request): StoredFile[] {
      const files = req.files ?? [];
      return [
        ...(Array.isArray(files) ? files : Object.values(files).flat()),
        ...(req.file ? [req.file] : []),
      ] as StoredFile[];
    },
  };
}
