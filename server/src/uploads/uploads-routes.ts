import { idParamsSchema, staffRoles, type AcceptedUpload, type RejectedUpload } from '@clearbase/contracts';
import type { Request, Response } from 'express';
import multer from 'multer';
import { unlink } from 'node:fs/promises';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import { createFilmBaseService } from '../film-base/film-base-service';
import { receiveMultipart } from '../http/receive-multipart';
import type { RouteModule } from '../http/route-module';
import { advanceOrderWithWork } from '../orders/advance-order-with-work';
import { recordOrderAudit } from '../orders/record-order-audit';
import { loadRollFor, scannerProfileOf } from '../rolls/roll-access';
import { setRollStatus } from '../rolls/roll-repository';
import { acceptNegative } from './accept-negative';
import { hashingDiskStorage, type HashedUpload } from './hashing-disk-storage';
import { createValidationBudget } from './validation-budget';

/** The multipart field the scans travel in. */
export const uploadField = 'files';

/** Negative scans uploaded to a roll: each file judged on its own, the good ones kept as frames. */
export const uploadsRoutes: RouteModule = (api, { db, config, clock }) => {
  const store = createFileStore(config.dataDir);
  const { maxFiles, maxFileBytes, maxPixels, validationMemoryBytes } = config.uploads;
  // One budget for every upload request this app serves, so a burst of them queues instead of decoding all at once.
  const budget = createValidationBudget(validationMemoryBytes);
  const upload = multer({
    storage: hashingDiskStorage({ tempPath: () => store.tempPath(), maxFileBytes }),
    // file size is judged per file by the storage engine; these limits refuse the request as a whole
    // (1 MB per text field and 20 fields: ample for a note alongside the files, our choice)
    limits: { files: maxFiles, fields: 20, fieldSize: 1024 * 1024 },
    defParamCharset: 'utf8',
  } as multer.Options).array(uploadField, maxFiles);

  const receive = (req: Request, res: Response) =>
    receiveMultipart(upload, req, res, { fields: { [uploadField]: maxFiles } });

  api.define(
    {
      method: 'post',
      path: '/api/rolls/:id/frames',
      roles: staffRoles,
      params: idParamsSchema,
      summary: `Upload negative scans (multipart field "${uploadField}"); each file accepted or rejected on its own`,
    },
    async (req, res, { params, user }) => {
      const roll = await loadRollFor(db, params.id, user!);
      await receive(req, res);
      const files = (req.files ?? []) as (Express.Multer.File & HashedUpload)[];
      if (files.length === 0) {
        throw new AppError(
          'no-files',
          400,
          `Send one or more negative scans as multipart/form-data in the field "${uploadField}".`,
        );
      }
      const scanner = await scannerProfileOf(db, roll.scanner_id);
      const accepted: AcceptedUpload[] = [];
      const rejected: RejectedUpload[] = [];
      try {
        for (const file of files) {
          const result = await acceptNegative(
            { db, store, clock, budget },
            { ...file, fileName: file.originalname },
            { id: roll.id, scanner, maxFileBytes, maxPixels },
          );
          if ('accepted' in result) accepted.push(result.accepted);
          else rejected.push(result.rejected);
        }
      } finally {
        // files not reached when something failed half-way must not stay in the temp folder
        await Promise.all(files.map((f) => unlink(f.path).catch(() => undefined)));
      }
      if (accepted.length === 0) {
        throw new AppError(
          'no-usable-scans',
          422,
          `None of the ${files.length} files was kept: ${rejected.map((r) => `${r.fileName}: ${r.reason}`).join(' ')}`,
          rejected.map((r) => ({ path: `files.${r.fileName}`, message: `${r.fileName}: ${r.reason}` })),
        );
      }
      const at = clock.now();
      if (roll.status === 'awaiting-scans') await setRollStatus(db, roll.id, 'scanned', at);
      // the roll base an operator sees follows its frames: the robust median of their bases
      await createFilmBaseService({ db, store, clock, maxPixels }).followFrames(roll);
      await recordOrderAudit(db, {
        at,
        actor: user!,
        action: 'frames-uploaded',
        target: `roll:${roll.id}`,
        details: {
          accepted: accepted.map((a) => ({ fileName: a.fileName, frameId: a.frameId })),
          rejected: rejected.map((r) => ({ fileName: r.fileName, code: r.code })),
        },
      });
      await advanceOrderWithWork(db, roll.order_id, at);
      res.status(201).json({ accepted, rejected });
    },
  );
};
