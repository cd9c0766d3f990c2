import type {
  Calibration,
  CalibrationInputs,
  CalibrationListQuery,
  CalibrationSummary,
  ScannerProfile,
  User,
} from '@clearbase/contracts';
import type { CalibrationStock } from '@clearbase/inversion';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database, StockRow } from '../db/database';
import { AppError } from '../errors/app-error';
import { findFileById, recordFile } from '../files/file-repository';
import type { FileRow } from '../files/file-tables';
import type { FileStore } from '../files/file-store';
import { createProfilesService } from '../profiles/profiles-service';
import { scannerProfileOf } from '../rolls/roll-access';
import { findScannerById } from '../scanners/scanner-repository';
import { findStockById } from '../stocks/stock-repository';
import {
  findCalibrationById,
  insertCalibration,
  linkCalibrationToVersion,
  listCalibrations,
  toCalibration,
  toCalibrationSummary,
} from './calibration-repository';
import { listCalibrationRollsOnFile, type CalibrationRollOnFile } from './calibration-rolls-on-file';
import type { ReceivedCalibration } from './calibration-upload';
import { fitCalibrationRoll } from './fit-calibration-roll';

/** The film base kind the library names, from a stock's sheet. */
function stockBase(stock: StockRow): CalibrationStock['base'] {
  if (stock.masked) return 'masked';
  return /tint/i.test(stock.base_material) ? 'tinted' : 'clear';
}

export interface CalibrationsDeps {
  db: Kysely<Database>;
  clock: Clock;
  store: FileStore;
  maxPixels: number;
}

/**
 * Calibration rolls: a grey bracket and a chart frame fitted into a draft profile version, linked both ways; the
 * records, and the rolls on file ready to mark and fit.
 *
 * @example
 * const calibrations = createCalibrationsService({ db, clock, store, maxPixels });
 * const made = await calibrations.create(operator, await upload.receive(req, res));
 */
export function createCalibrationsService({ db, clock, store, maxPixels }: CalibrationsDeps) {
  const profiles = createProfilesService({ db, clock });

  async function load(id: number): Promise<Calibration> {
    const row = await findCalibrationById(db, id);
    if (!row) throw new AppError('calibration-not-found', 404, `No calibration with id ${id}.`);
    return toCalibration(row);
  }

  return {
    load,

    /**
     * Fits a received calibration roll on a worker, keeps its frames in the file store, and records the calibration
     * with its draft profile version in one audited transaction. Only a fitted roll's files are kept: the caller
     * removes the uploads whatever happens.
     */
    async create(actor: User, { request, uploads }: ReceivedCalibration): Promise<Calibration> {
      const stock = await findStockById(db, request.stockId);
      if (!stock) {
        throw new AppError('stock-not-found', 422, `No stock with id ${request.stockId}.`, [
          { path: 'stockId', message: 'no such stock' },
        ]);
      }
      if (request.scannerId !== null && !(await findScannerById(db, request.scannerId))) {
        throw new AppError('scanner-not-found', 422, `No scanner with id ${request.scannerId}.`, [
          { path: 'scannerId', message: 'no such scanner' },
        ]);
      }
      const scanner: ScannerProfile = await scannerProfileOf(db, request.scannerId);
      const fitted = await fitCalibrationRoll(uploads, request, {
        scanner,
        stock: { name: stock.name, iso: stock.iso, base: stockBase(stock) },
        maxPixels,
      });

      const at = clock.now();
      const frames = uploads.map((u) => ({ upload: u, read: fitted.frames.find((f) => f.upload === u)! }));
      const kept: FileRow[] = [];
      for (const { upload, read } of frames) {
        await store.adopt(upload.path, upload.file.sha256);
        kept.push(
          await recordFile(db, {
            sha256: upload.file.sha256,
            size: upload.file.size,
            mediaType: read.format === 'png' ? 'image/png' : 'image/tiff',
            at,
          }),
        );
      }
      const inputs: CalibrationInputs = {
        frames: frames.map(({ upload: u, read }, i) => ({
          n: i + 1,
          role: u.role,
          fileId: kept[i]!.id,
          fileName: u.fileName,
          width: read.width,
          height: read.height,
          bitDepth: read.bitDepth,
          stops: u.role === 'bracket' ? request.bracket[u.index]!.stops : null,
          greyRegion:
            u.role === 'bracket' ? (request.bracket[u.index]!.greyRegion ?? request.greyRegion) : null,
        })),
        greyRegion: request.greyRegion,
        chartCorners: request.chartCorners ?? null,
        chartRegion: request.chartRegion ?? null,
        baseRegion: request.baseRegion,
      };

      const id = await db.transaction().execute(async (trx) => {
        const row = await insertCalibration(trx, {
          stockId: stock.id,
          scannerId: request.scannerId,
          inputs,
          fit: fitted.fit,
          residuals: fitted.residuals,
          warnings: fitted.warnings,
          at,
          by: actor.id,
        });
        const draft = await profiles.draftFromCalibration(trx, actor, {
          stock,
          scannerId: request.scannerId,
          parameters: fitted.profileDocument,
          calibrationId: row.id,
          at,
        });
        await linkCalibrationToVersion(trx, row.id, draft.versionId);
        await recordAudit(trx, {
          at,
          actor,
          action: 'calibration-created',
          target: `calibration:${row.id}`,
          details: {
            stockId: stock.id,
            profileId: draft.profileId,
            profileVersionId: draft.versionId,
            created: draft.created,
            gamma: fitted.fit.gamma,
            ei: fitted.fit.ei,
            warnings: fitted.warnings.filter((w) => w.severity === 'warning').map((w) => w.code),
          },
        });
        return row.id;
      });
      return load(id);
    },

    async list(query: CalibrationListQuery): Promise<CalibrationSummary[]> {
      return (await listCalibrations(db, query)).map(toCalibrationSummary);
    },

    /** The stored file of frame `n` of a calibration (1 … bracket, then chart, then leader). */
    async frameFile(id: number, n: number): Promise<FileRow> {
      const calibration = await load(id);
      const frame = calibration.inputs.frames.find((f) => f.n === n);
      if (!frame) {
        throw new AppError(
          'calibration-frame-not-found',
          404,
          `Calibration ${calibration.id} has frames 1 to ${calibration.inputs.frames.length}, not ${n}.`,
        );
      }
      const file = await findFileById(db, frame.fileId);
      if (!file) throw new AppError('calibration-frame-not-found', 404, `The file of frame ${n} is gone.`);
      return file;
    },

    /** Calibration rolls on file whose stock still exists, with the stock's name. */
    async rollsOnFile(): Promise<(CalibrationRollOnFile & { stockName: string })[]> {
      const rolls = await listCalibrationRollsOnFile(db);
      const names = new Map<number, string>();
      for (const r of rolls) {
        if (!names.has(r.stockId)) names.set(r.stockId, (await findStockById(db, r.stockId))?.name ?? '');
      }
      return rolls
        .filter((r) => names.get(r.stockId))
        .map((r) => ({ ...r, stockName: names.get(r.stockId)! }));
    },

    /** Frame `n` of a calibration roll on file, with its stored file. */
    async rollFrame(id: number, n: number): Promise<{ fileName: string; file: FileRow }> {
      const roll = (await listCalibrationRollsOnFile(db)).find((r) => r.id === id);
      if (!roll)
        throw new AppError('calibration-roll-not-found', 404, `No calibration roll on file with id ${id}.`);
      const frame = roll.frames.find((f) => f.n === n);
      const file = frame ? await findFileById(db, frame.fileId) : undefined;
      if (!frame || !file) {
        throw new AppError(
          'calibration-frame-not-found',
          404,
          `Calibration roll ${roll.id} has frames 1 to ${roll.frames.length}, not ${n}.`,
        );
      }
      return { fileName: frame.fileName, file };
    },
  };
}
