import {
  calibrationFrameParamsSchema,
  calibrationPreviewHeaders,
  calibrationListQuerySchema,
  createCalibrationRequestSchema,
  idParamsSchema,
  staffRoles,
  type CalibrationInputs,
  type CreateCalibrationRequest,
  type ScannerProfile,
  type User,
} from '@clearbase/contracts';
import type { CalibrationStock } from '@clearbase/inversion';
import type { Request, Response } from 'express';
import type { Kysely } from 'kysely';
import multer from 'multer';
import { randomUUID } from 'node:crypto';
import { unlink } from 'node:fs/promises';
import sharp from 'sharp';
import { recordAudit } from '../audit/audit-log';
import type { Database, StockRow } from '../db/database';
import { AppError, type FieldError } from '../errors/app-error';
import { findFileById, recordFile } from '../files/file-repository';
import { createFileStore, type FileStore } from '../files/file-store';
import type { RouteModule } from '../http/route-module';
import { ImageInputError, readNegative } from '../imaging/index';
import {
  insertDraft,
  insertProfile,
  listProfilesOfStock,
  listVersionsOfProfiles,
  toVersionSummary,
} from '../profiles/profile-repository';
import { recordCatalogueAudit } from '../profiles/record-catalogue-audit';
import { scannerProfileOf } from '../rolls/roll-access';
import { findScannerById } from '../scanners/scanner-repository';
import { findStockById } from '../stocks/stock-repository';
import { hashingDiskStorage, type HashedUpload } from '../uploads/hashing-disk-storage';
import {
  findCalibrationById,
  insertCalibration,
  linkCalibrationToVersion,
  listCalibrations,
  toCalibration,
  toCalibrationSummary,
} from './calibration-repository';
import { writeCalibrationReport } from './calibration-report-pdf';
import { listCalibrationRollsOnFile } from './calibration-rolls-on-file';
import { fitCalibrationRoll, framePath, type CalibrationUpload } from './fit-calibration-roll';

/** The multipart fields of a new calibration: files and the JSON of marks and stops. */
export const calibrationFields = {
  bracket: 'bracket',
  chart: 'chart',
  leader: 'leader',
  json: 'calibration',
} as const;
/** Most grey frames in one calibration (the request schema's limit). */
const maxBracketFrames = 100;
/** Long edge of frame previews, pixels: enough to click a chart's corners on any screen (our choice). */
export const calibrationPreviewLongEdge = 2048;
// JPEG quality 85 for looking at a negative, not for delivery: common practice for web previews, from memory
const previewQuality = 85;

type MulterFiles = Record<string, (Express.Multer.File & HashedUpload)[]>;

/** The film base kind the library names, from a stock's sheet. */
function stockBase(stock: StockRow): CalibrationStock['base'] {
  if (stock.masked) return 'masked';
  return /tint/i.test(stock.base_material) ? 'tinted' : 'clear';
}

function parseRequest(raw: unknown): CreateCalibrationRequest {
  let json: unknown;
  try {
    json = typeof raw === 'string' ? JSON.parse(raw) : undefined;
  } catch {
    json = undefined;
  }
  if (json === undefined)
    throw new AppError(
      'invalid-request',
      400,
      `Send the stops and marks as JSON in the multipart field "${calibrationFields.json}".`,
      [{ path: calibrationFields.json, message: 'missing or not JSON' }],
    );
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

async function sendPreview(res: Response, path: string, maxPixels: number): Promise<void> {
  const negative = await readNegative(path, { maxPixels });
  // stretched levels: a negative on a clear base is low in contrast and the chart's corners must be visible
  const bytes = await sharp(path)
    .resize(calibrationPreviewLongEdge, calibrationPreviewLongEdge, {
      fit: 'inside',
      withoutEnlargement: true,
    })
    .normalise()
    .toColourspace('srgb')
    .jpeg({ quality: previewQuality })
    .toBuffer();
  res.set(calibrationPreviewHeaders.width, String(negative.width));
  res.set(calibrationPreviewHeaders.height, String(negative.height));
  res.set('Access-Control-Expose-Headers', Object.values(calibrationPreviewHeaders).join(', '));
  res.type('image/jpeg').send(bytes);
}

/** Finds the stock's profile for this scanner, or makes one, and adds the calibration's draft to it. */
async function addCalibratedDraft(
  trx: Kysely<Database>,
  args: {
    stock: StockRow;
    scannerId: number | null;
    document: Parameters<typeof insertDraft>[1]['parameters'];
    calibrationId: number;
    at: Date;
    user: User;
  },
) {
  const { stock, scannerId, at, user } = args;
  const existing = (await listProfilesOfStock(trx, stock.id))
    .filter((p) => p.scanner_id === scannerId)
    .at(-1);
  const profile =
    existing ??
    (await insertProfile(trx, {
      stockId: stock.id,
      scannerId,
      name: `${stock.name} (calibrated)`,
      documentId: randomUUID(),
      at,
      by: user.id,
    }));
  const latest = existing ? (await listVersionsOfProfiles(trx, [existing.id])).at(-1) : undefined;
  const draft = await insertDraft(trx, {
    profile,
    parentVersionId: latest?.id ?? null,
    parameters: args.document,
    at,
    by: user.id,
  });
  await linkCalibrationToVersion(trx, args.calibrationId, draft.id);
  await recordCatalogueAudit(trx, {
    at,
    actor: user,
    action: existing ? 'profile-version-created' : 'profile-created',
    target: existing ? `profile-version:${draft.id}` : `profile:${profile.id}`,
    before: null,
    after: { profileId: profile.id, version: toVersionSummary(draft), calibrationId: args.calibrationId },
  });
  return { profile, draft, created: existing ? ('draft' as const) : ('profile' as const) };
}

/**
 * Calibration rolls: grey bracket and chart frames uploaded with their stops and marks, fitted into a draft profile
 * version linked both ways; the record, its report as PDF and previews of its frames.
 */
export const calibrationsRoutes: RouteModule = (api, { db, config, clock }) => {
  const store: FileStore = createFileStore(config.dataDir);
  const { maxFiles, maxFileBytes, maxPixels } = config.uploads;
  const upload = multer({
    storage: hashingDiskStorage({ tempPath: () => store.tempPath(), maxFileBytes }),
    // the marks and stops travel as one JSON field; 1 MB is ample (our choice)
    limits: { files: Math.min(maxFiles, maxBracketFrames + 2), fields: 4, fieldSize: 1024 * 1024 },
    defParamCharset: 'utf8',
  } as multer.Options);
  const calibrationUpload = upload.fields([
    { name: calibrationFields.bracket, maxCount: maxBracketFrames },
    { name: calibrationFields.chart, maxCount: 1 },
    { name: calibrationFields.leader, maxCount: 1 },
  ]);
  const previewUpload = upload.single('file');

  const receive = (handler: typeof calibrationUpload, req: Request, res: Response) =>
    new Promise<void>((resolve, reject) =>
      handler(req, res, (err: unknown) => {
        if (!err) return resolve();
        if (err instanceof multer.MulterError)
          return reject(
            new AppError(
              err.code === 'LIMIT_FILE_COUNT' ? 'too-many-files' : 'upload-invalid',
              err.code === 'LIMIT_FILE_COUNT' ? 413 : 400,
              `${err.message}${err.field ? ` (field "${err.field}")` : ''}; nothing was kept.`,
            ),
          );
        reject(new AppError('upload-invalid', 400, 'The upload could not be read; nothing was kept.'));
      }),
    );

  const loadCalibration = async (id: number) => {
    const row = await findCalibrationById(db, id);
    if (!row) throw new AppError('calibration-not-found', 404, `No calibration with id ${id}.`);
    return row;
  };

  api.define(
    {
      method: 'post',
      path: '/api/calibrations',
      roles: staffRoles,
      summary:
        'Fit a calibration roll (multipart: bracket files, chart, optional leader, JSON "calibration") into a draft profile version',
    },
    async (req, res, { user }) => {
      await receive(calibrationUpload, req, res);
      const files = (req.files ?? {}) as MulterFiles;
      const all = Object.values(files).flat();
      try {
        const request = parseRequest(
          (req.body as Record<string, unknown> | undefined)?.[calibrationFields.json],
        );
        const brackets = files[calibrationFields.bracket] ?? [];
        const chart = files[calibrationFields.chart]?.[0];
        const leader = files[calibrationFields.leader]?.[0];
        const missing: FieldError[] = [];
        if (brackets.length !== request.bracket.length)
          missing.push({
            path: 'bracket',
            message: `${request.bracket.length} grey frames are described but ${brackets.length} files were sent; send one file per entry, in the same order`,
          });
        if (!chart) missing.push({ path: 'chart', message: 'send the chart frame in the field "chart"' });
        if (missing.length)
          throw new AppError(
            'calibration-frames-missing',
            422,
            'Frames are missing from the upload.',
            missing,
          );
        const uploads: (CalibrationUpload & { file: HashedUpload })[] = [
          ...brackets.map((f, index) => ({
            role: 'bracket' as const,
            index,
            path: f.path,
            fileName: f.originalname,
            file: f,
          })),
          { role: 'chart', index: 0, path: chart!.path, fileName: chart!.originalname, file: chart! },
          ...(leader
            ? [
                {
                  role: 'leader' as const,
                  index: 0,
                  path: leader.path,
                  fileName: leader.originalname,
                  file: leader,
                },
              ]
            : []),
        ];
        const tooLarge = uploads.filter((u) => u.file.tooLarge);
        if (tooLarge.length)
          throw new AppError(
            'file-too-large',
            413,
            `Frames larger than the limit of ${maxFileBytes} bytes; nothing was kept.`,
            tooLarge.map((u) => ({
              path: framePath(u),
              message: `${u.fileName} is larger than ${maxFileBytes} bytes`,
            })),
          );

        const stock = await findStockById(db, request.stockId);
        if (!stock)
          throw new AppError('stock-not-found', 422, `No stock with id ${request.stockId}.`, [
            { path: 'stockId', message: 'no such stock' },
          ]);
        if (request.scannerId !== null && !(await findScannerById(db, request.scannerId)))
          throw new AppError('scanner-not-found', 422, `No scanner with id ${request.scannerId}.`, [
            { path: 'scannerId', message: 'no such scanner' },
          ]);
        const scanner: ScannerProfile = await scannerProfileOf(db, request.scannerId);
        const fitted = await fitCalibrationRoll(uploads, request, {
          scanner,
          stock: { name: stock.name, iso: stock.iso, base: stockBase(stock) },
          maxPixels,
        });

        // Only a fitted roll's files are kept.
        const kept = new Map<CalibrationUpload, number>();
        const at = clock.now();
        for (const u of uploads) {
          const frame = fitted.frames.find((f) => f.upload === u)!;
          await store.adopt(u.path, u.file.sha256);
          const row = await recordFile(db, {
            sha256: u.file.sha256,
            size: u.file.size,
            mediaType: frame.format === 'png' ? 'image/png' : 'image/tiff',
            at,
          });
          kept.set(u, row.id);
        }
        const inputs: CalibrationInputs = {
          frames: uploads.map((u, i) => {
            const frame = fitted.frames.find((f) => f.upload === u)!;
            return {
              n: i + 1,
              role: u.role,
              fileId: kept.get(u)!,
              fileName: u.fileName,
              width: frame.width,
              height: frame.height,
              bitDepth: frame.bitDepth,
              stops: u.role === 'bracket' ? request.bracket[u.index]!.stops : null,
              greyRegion:
                u.role === 'bracket' ? (request.bracket[u.index]!.greyRegion ?? request.greyRegion) : null,
            };
          }),
          greyRegion: request.greyRegion,
          chartCorners: request.chartCorners ?? null,
          chartRegion: request.chartRegion ?? null,
          baseRegion: request.baseRegion,
        };

        const made = await db.transaction().execute(async (trx) => {
          const row = await insertCalibration(trx, {
            stockId: stock.id,
            scannerId: request.scannerId,
            inputs,
            fit: fitted.fit,
            residuals: fitted.residuals,
            warnings: fitted.warnings,
            at,
            by: user!.id,
          });
          const draft = await addCalibratedDraft(trx, {
            stock,
            scannerId: request.scannerId,
            document: fitted.profileDocument,
            calibrationId: row.id,
            at,
            user: user!,
          });
          await recordAudit(trx, {
            at,
            actor: user!,
            action: 'calibration-created',
            target: `calibration:${row.id}`,
            details: {
              stockId: stock.id,
              profileId: draft.profile.id,
              profileVersionId: draft.draft.id,
              created: draft.created,
              gamma: fitted.fit.gamma,
              ei: fitted.fit.ei,
              warnings: fitted.warnings.filter((w) => w.severity === 'warning').map((w) => w.code),
            },
          });
          return row.id;
        });
        res.status(201).json(toCalibration((await findCalibrationById(db, made))!));
      } finally {
        await Promise.all(all.map((f) => unlink(f.path).catch(() => undefined)));
      }
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/calibrations/frame-preview',
      roles: staffRoles,
      summary:
        'A JPEG preview of one scan (multipart field "file") before it is submitted, sized in X-Frame-Width/Height',
    },
    async (req, res) => {
      await receive(previewUpload, req, res);
      const file = req.file as (Express.Multer.File & HashedUpload) | undefined;
      try {
        if (!file)
          throw new AppError('no-files', 400, 'Send one scan as multipart/form-data in the field "file".');
        if (file.tooLarge)
          throw new AppError(
            'file-too-large',
            413,
            `The file is larger than the limit of ${maxFileBytes} bytes.`,
          );
        try {
          await sendPreview(res, file.path, maxPixels);
        } catch (error) {
          if (error instanceof ImageInputError)
            throw new AppError(error.code, 422, `${file.originalname}: ${error.message}`, [
              { path: 'file', message: error.message },
            ]);
          throw error;
        }
      } finally {
        if (file) await unlink(file.path).catch(() => undefined);
      }
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/calibrations',
      roles: staffRoles,
      query: calibrationListQuerySchema,
      summary: 'Calibrations, newest first (of a stock, or the one that made a version)',
    },
    async (_req, res, { query }) => {
      res.json({ calibrations: (await listCalibrations(db, query)).map(toCalibrationSummary) });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/calibrations/:id',
      roles: staffRoles,
      params: idParamsSchema,
      summary: 'A calibration: inputs, fitted values, residuals, warnings, its draft',
    },
    async (_req, res, { params }) => {
      res.json(toCalibration(await loadCalibration(params.id)));
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/calibrations/:id/report.pdf',
      roles: staffRoles,
      params: idParamsSchema,
      summary: 'The calibration report as a PDF: curves, γ, speed point, ΔE00 per patch, spread, warnings',
    },
    async (_req, res, { params }) => {
      const calibration = toCalibration(await loadCalibration(params.id));
      res.type('application/pdf');
      res.attachment(`calibration-${calibration.id}.pdf`);
      await writeCalibrationReport(calibration, res);
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/calibration-rolls',
      roles: staffRoles,
      summary: 'Calibration rolls on file: frames in the file store with their stops, ready to mark and fit',
    },
    async (_req, res) => {
      const rolls = await listCalibrationRollsOnFile(db);
      const stockNames = new Map<number, string>();
      for (const r of rolls) {
        if (!stockNames.has(r.stockId))
          stockNames.set(r.stockId, (await findStockById(db, r.stockId))?.name ?? '');
      }
      res.json({
        rolls: rolls
          .filter((r) => stockNames.get(r.stockId))
          .map((r) => ({ ...r, stockName: stockNames.get(r.stockId)! })),
      });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/calibration-rolls/:id/frames/:n',
      roles: staffRoles,
      params: calibrationFrameParamsSchema,
      summary:
        'The scan of one frame of a calibration roll on file, as stored (to load it on the calibration page)',
    },
    async (_req, res, { params }) => {
      const roll = (await listCalibrationRollsOnFile(db)).find((r) => r.id === params.id);
      if (!roll)
        throw new AppError(
          'calibration-roll-not-found',
          404,
          `No calibration roll on file with id ${params.id}.`,
        );
      const frame = roll.frames.find((f) => f.n === params.n);
      const file = frame ? await findFileById(db, frame.fileId) : undefined;
      if (!frame || !file)
        throw new AppError(
          'calibration-frame-not-found',
          404,
          `Calibration roll ${roll.id} has frames 1 to ${roll.frames.length}, not ${params.n}.`,
        );
      res.set('Cache-Control', 'private, max-age=3600');
      res.type(file.media_type);
      res.attachment(frame.fileName);
      res.sendFile(store.pathOf(file.sha256));
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/calibrations/:id/frames/:n/preview',
      roles: staffRoles,
      params: calibrationFrameParamsSchema,
      summary: 'A JPEG preview of a calibration frame (1 … bracket, then chart, then leader)',
    },
    async (_req, res, { params }) => {
      const calibration = toCalibration(await loadCalibration(params.id));
      const frame = calibration.inputs.frames.find((f) => f.n === params.n);
      if (!frame)
        throw new AppError(
          'calibration-frame-not-found',
          404,
          `Calibration ${calibration.id} has frames 1 to ${calibration.inputs.frames.length}, not ${params.n}.`,
        );
      const file = await findFileById(db, frame.fileId);
      if (!file)
        throw new AppError('calibration-frame-not-found', 404, `The file of frame ${params.n} is gone.`);
      res.set('Cache-Control', 'private, max-age=3600');
      await sendPreview(res, store.pathOf(file.sha256), maxPixels);
    },
  );
};
