import {
  adjustmentsSchema,
  frameBaseRequestSchema,
  idParamsSchema,
  staffRoles,
  workingNegativeHeaders,
  workingNegativeLongEdge,
  type PixelRegion,
  type ProfileDocument,
} from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import { baseChangeHandler } from '../film-base/base-change-handler';
import { createFilmBaseService } from '../film-base/film-base-service';
import { createFileStore } from '../files/file-store';
import type { RouteModule } from '../http/route-module';
import { sendRawPixels } from '../http/send-raw-pixels';
import { readNegative } from '../imaging/index';
import { findVersionById } from '../profiles/profile-repository';
import { createAdjustmentsService } from '../tuning/adjustments-service';
import { scannerProfileOf } from '../rolls/roll-access';
import { findRollById } from '../rolls/roll-repository';
import { workingNegativeCacheOf } from '../tuning/working-negative-cache';
import { measureBaseOffThread, measureLevelsOffThread } from '../tuning/working-negative-worker';
import { loadFrameFor } from './frame-access';
import { frameSourceFile } from './frame-negative';

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

/**
 * What staff change on one frame while tuning, and what the tuning screen previews it from: the frame's base, its
 * adjustments on top of the roll's, and its working negative (made once per scan and kept in the file store; no
 * pixel loop runs on the event loop) with the base and levels it renders with.
 */
export const frameTuningRoutes: RouteModule = (api, { db, config, clock }) => {
  const store = createFileStore(config.dataDir);
  const { maxPixels } = config.uploads;
  const filmBase = createFilmBaseService({ db, store, clock, maxPixels });
  const adjustments = createAdjustmentsService({ db, clock });
  const workingNegatives = workingNegativeCacheOf(store);

  api.define(
    {
      method: 'put',
      path: '/api/frames/:id/base',
      roles: staffRoles,
      params: idParamsSchema,
      body: frameBaseRequestSchema,
      summary: 'Set a frame’s base: automatic, or a rectangle over unexposed film',
    },
    baseChangeHandler(filmBase.setFrameBase),
  );

  api.define(
    {
      method: 'put',
      path: '/api/frames/:id/adjustments',
      roles: staffRoles,
      params: idParamsSchema,
      body: adjustmentsSchema,
      summary: 'Tune one frame on top of its roll',
    },
    async (_req, res, { params, body, user }) => {
      res.json(await adjustments.adjustFrame(user!, params.id, body));
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/working-negative',
      roles: staffRoles,
      params: idParamsSchema,
      summary:
        'The frame’s negative reduced to a long edge of 1500, raw 16-bit RGB, with its base and levels',
    },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const roll = (await findRollById(db, frame.roll_id))!;
      const scanner = await scannerProfileOf(db, roll.scanner_id);
      const source = await frameSourceFile(db, store, frame);
      const working = await workingNegatives.get(source, workingNegativeLongEdge, maxPixels);
      const chosen = await filmBase.chooseForFrame(frame, roll, async () => {
        // a frame whose base was not measured on upload: its full scan is measured now, off the event loop
        const image = await readNegative(source.path, { maxPixels });
        const region = parse<PixelRegion>(frame.base_region);
        return measureBaseOffThread({ kind: 'base', image, scanner, region }).catch(() => null);
      });
      if (!chosen.usable) throw new AppError('no-base', 422, chosen.reason);
      const version = (await findVersionById(db, roll.profile_version_id))!;
      const levels = await measureLevelsOffThread({
        kind: 'levels',
        sample: working.sample,
        profile: JSON.parse(version.parameters) as ProfileDocument,
        scanner,
        base: chosen.base.rgb,
      });
      sendRawPixels(res, {
        pixels: working.pixels,
        cacheControl: 'private, no-cache',
        headers: {
          [workingNegativeHeaders.width]: String(working.width),
          [workingNegativeHeaders.height]: String(working.height),
          [workingNegativeHeaders.base]: chosen.base.rgb.map((b) => b.toPrecision(9)).join(','),
          [workingNegativeHeaders.baseSource]: chosen.source,
          [workingNegativeHeaders.scanSize]: `${working.scanWidth}x${working.scanHeight}`,
          [workingNegativeHeaders.levels]: JSON.stringify(levels),
        },
      });
    },
  );
};
