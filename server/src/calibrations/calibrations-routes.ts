import {
  calibrationFrameParamsSchema,
  calibrationListQuerySchema,
  idParamsSchema,
  staffRoles,
} from '@clearbase/contracts';
import { unlink } from 'node:fs/promises';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import type { RouteModule } from '../http/route-module';
import { ImageInputError } from '../imaging/index';
import { sendCalibrationPreview } from './calibration-preview';
import { writeCalibrationReport } from './calibration-report-pdf';
import { createCalibrationUpload } from './calibration-upload';
import { createCalibrationsService } from './calibrations-service';

/**
 * Calibration rolls: grey bracket and chart frames uploaded with their stops and marks, fitted into a draft profile
 * version linked both ways; the record, its report as PDF and previews of its frames (the rules are in
 * calibrations-service.ts, the upload's checks in calibration-upload.ts).
 */
export const calibrationsRoutes: RouteModule = (api, { db, config, clock }) => {
  const store = createFileStore(config.dataDir);
  const { maxFiles, maxFileBytes, maxPixels } = config.uploads;
  const upload = createCalibrationUpload(store, { maxFiles, maxFileBytes });
  const calibrations = createCalibrationsService({ db, clock, store, maxPixels });
  const discard = (paths: string[]) => Promise.all(paths.map((p) => unlink(p).catch(() => undefined)));
  const preview = async (res: Parameters<typeof sendCalibrationPreview>[0], path: string, name: string) => {
    try {
      await sendCalibrationPreview(res, path, maxPixels);
    } catch (error) {
      if (error instanceof ImageInputError) {
        throw new AppError(error.code, 422, `${name}: ${error.message}`, [
          { path: 'file', message: error.message },
        ]);
      }
      throw error;
    }
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
      try {
        const made = await calibrations.create(user!, await upload.receive(req, res));
        res.status(201).json(made);
      } finally {
        // kept files were adopted into the store; what is left here is the upload's temporary copies
        await discard(upload.filesOf(req).map((f) => f.path));
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
      try {
        const file = await upload.receiveScan(req, res);
        await preview(res, file.path, file.originalname);
      } finally {
        await discard(upload.filesOf(req).map((f) => f.path));
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
      res.json({ calibrations: await calibrations.list(query) });
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
      res.json(await calibrations.load(params.id));
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
      const calibration = await calibrations.load(params.id);
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
      res.json({ rolls: await calibrations.rollsOnFile() });
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
      const { fileName, file } = await calibrations.rollFrame(params.id, params.n);
      res.set('Cache-Control', 'private, max-age=3600');
      res.type(file.media_type);
      res.attachment(fileName);
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
      const file = await calibrations.frameFile(params.id, params.n);
      res.set('Cache-Control', 'private, max-age=3600');
      await preview(res, store.pathOf(file.sha256), `Frame ${params.n}`);
    },
  );
};
