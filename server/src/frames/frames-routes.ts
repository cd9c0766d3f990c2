import {
  frameBaseRequestSchema,
  frameOutputQuerySchema,
  idParamsSchema,
  staffRoles,
  type MeasuredBase,
  type User,
} from '@clearbase/contracts';
import type { Response } from 'express';
import type { Kysely } from 'kysely';
import { basename, extname } from 'node:path';
import sharp from 'sharp';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { recordFile } from '../files/file-repository';
import { createFileStore, type FileStore } from '../files/file-store';
import type { RouteModule } from '../http/route-module';
import { POSITIVE_EXTENSIONS } from '../imaging/index';
import { isStaff, ownerOfRoll } from '../orders/order-access';
import type { FrameRow } from '../orders/order-tables';
import { recordOrderAudit } from '../orders/record-order-audit';
import { assertRegionInside } from '../rolls/region-check';
import { scannerProfileOf } from '../rolls/roll-access';
import { findRollById } from '../rolls/roll-repository';
import { measureNegativeBase } from './measure-base';
import { frameNegative, frameSourcePath } from './frame-negative';
import {
  findFrameById,
  findFrameOutput,
  outputFormatsOfFrames,
  putFrameOutput,
  toFrame,
} from './frame-repository';

const everyone = ['customer', ...staffRoles] as const;
/** Long edge of the previews, pixels: sharp enough for a full-screen view, small enough to load fast (our choice). */
export const previewLongEdge = 2048;
// JPEG quality 85 for a look at the negative, not for delivery: common practice for web previews, from memory
const negativePreviewQuality = 85;

const frameNotFound = (id: number) => new AppError('frame-not-found', 404, `No frame with id ${id}.`);

/** The frame if this user may see it; another customer's frame answers the same 404 as a missing one. */
export async function loadFrameFor(db: Kysely<Database>, id: number, user: User): Promise<FrameRow> {
  const frame = await findFrameById(db, id);
  if (!frame) throw frameNotFound(id);
  if (!isStaff(user) && (await ownerOfRoll(db, frame.roll_id)) !== user.id) throw frameNotFound(id);
  return frame;
}

function sendStored(
  res: Response,
  store: FileStore,
  sha256: string,
  mediaType: string,
  download?: string,
): void {
  res.type(mediaType);
  // stored files never change under their name, but access is per user
  res.set('Cache-Control', 'private, max-age=3600');
  if (download) res.attachment(download);
  res.sendFile(store.pathOf(sha256));
}

/** The negative as scanned, reduced to a JPEG preview, made on first request and kept in the store. */
async function negativePreview(
  db: Kysely<Database>,
  store: FileStore,
  frame: FrameRow,
  at: Date,
): Promise<{ sha256: string; media_type: string }> {
  const known = await findFrameOutput(db, frame.id, 'negative-preview');
  if (known) return known;
  const bytes = await sharp(await frameSourcePath(db, store, frame))
    .resize(previewLongEdge, previewLongEdge, { fit: 'inside', withoutEnlargement: true })
    .toColourspace('srgb')
    .jpeg({ quality: negativePreviewQuality })
    .toBuffer();
  const stored = await store.putBytes(bytes);
  await db.transaction().execute(async (trx) => {
    const file = await recordFile(trx, {
      sha256: stored.sha256,
      size: stored.size,
      mediaType: 'image/jpeg',
      at,
    });
    await putFrameOutput(trx, { frameId: frame.id, kind: 'negative-preview', fileId: file.id, at });
  });
  return { sha256: stored.sha256, media_type: 'image/jpeg' };
}

/** One frame: its record, previews, finished outputs and its base. */
export const framesRoutes: RouteModule = (api, { db, config, clock }) => {
  const store = createFileStore(config.dataDir);

  api.define(
    { method: 'get', path: '/api/frames/:id', roles: everyone, params: idParamsSchema, summary: 'A frame' },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const outputs = await outputFormatsOfFrames(db, [frame.id]);
      res.json(toFrame(frame, outputs.get(frame.id)));
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/preview',
      roles: everyone,
      params: idParamsSchema,
      summary: 'The positive as a JPEG, long edge 2048 (404 until rendered)',
    },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const preview = await findFrameOutput(db, frame.id, 'preview');
      if (!preview) {
        throw new AppError('preview-not-ready', 404, `Frame ${frame.id} has not been inverted yet.`);
      }
      sendStored(res, store, preview.sha256, preview.media_type);
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/negative-preview',
      roles: staffRoles,
      params: idParamsSchema,
      summary: 'The negative as scanned, as a JPEG, long edge 2048',
    },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const preview = await negativePreview(db, store, frame, clock.now());
      sendStored(res, store, preview.sha256, preview.media_type);
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/output',
      roles: everyone,
      params: idParamsSchema,
      query: frameOutputQuerySchema,
      summary: 'A finished positive: jpeg, tiff16 or png16 (404 until rendered)',
    },
    async (_req, res, { params, query, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const output = frame.status === 'done' ? await findFrameOutput(db, frame.id, query.format) : undefined;
      if (!output) {
        throw new AppError(
          'output-not-ready',
          404,
          frame.status === 'done'
            ? `Frame ${frame.id} was not rendered as ${query.format}; the order asks for other formats.`
            : `Frame ${frame.id} has not been inverted yet.`,
        );
      }
      const stem = basename(frame.file_name, extname(frame.file_name));
      sendStored(res, store, output.sha256, output.media_type, `${stem}${POSITIVE_EXTENSIONS[query.format]}`);
    },
  );

  api.define(
    {
      method: 'put',
      path: '/api/frames/:id/base',
      roles: staffRoles,
      params: idParamsSchema,
      body: frameBaseRequestSchema,
      summary: 'Set a frame’s base: automatic, or a rectangle over unexposed film',
    },
    async (_req, res, { params, body, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const roll = (await findRollById(db, frame.roll_id))!;
      const region = body.mode === 'region' ? body.region : null;
      if (region) assertRegionInside(region, frame.width, frame.height, 'body.region');
      const negative = await frameNegative(db, store, frame, config.uploads.maxPixels);
      let measured: MeasuredBase | null = null;
      try {
        measured = measureNegativeBase(negative, await scannerProfileOf(db, roll.scanner_id), region);
      } catch {
        measured = null;
      }
      if (region && (!measured || measured.confidence === 0)) {
        throw new AppError(
          'no-film-in-region',
          422,
          'The rectangle holds no film (only bare light or dust); draw it over unexposed film such as the rebate.',
          [{ path: 'body.region', message: 'No film in this rectangle' }],
        );
      }
      const updated = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        await trx
          .updateTable('frames')
          .set({
            base_mode: body.mode,
            base_region: region ? JSON.stringify(region) : null,
            base_measured: measured ? JSON.stringify(measured) : null,
            base_source: null,
          })
          .where('id', '=', frame.id)
          .execute();
        const after = (await findFrameById(trx, frame.id))!;
        await recordOrderAudit(trx, {
          at,
          actor: user!,
          action: 'frame-base-changed',
          target: `frame:${frame.id}`,
          details: { before: toFrame(frame).base, after: toFrame(after).base },
        });
        return after;
      });
      const outputs = await outputFormatsOfFrames(db, [frame.id]);
      res.json(toFrame(updated, outputs.get(frame.id)));
    },
  );
};
