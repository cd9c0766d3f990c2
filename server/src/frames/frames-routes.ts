import {
  frameOutputQuerySchema,
  frameOutputRegionHeaders,
  frameOutputRegionQuerySchema,
  idParamsSchema,
  staffRoles,
  type PixelRegion,
} from '@clearbase/contracts';
import type { Response } from 'express';
import { basename, extname } from 'node:path';
import sharp from 'sharp';
import { assertCustomerMayGet } from '../downloads/assert-customer-may-get';
import { AppError, type FieldError } from '../errors/app-error';
import { createFileStore, type FileStore } from '../files/file-store';
import type { RouteModule } from '../http/route-module';
import { POSITIVE_EXTENSIONS } from '../imaging/index';
import { loadFrameFor } from './frame-access';
import { findFrameOutput, findFullSizeOutput, outputFormatsOfFrames, toFrame } from './frame-repository';
import { negativePreviewOf } from './negative-preview';

const everyone = ['customer', ...staffRoles] as const;

/** Long edge of gallery thumbnails, pixels: two rows fit a laptop screen at four across (our choice). */
const thumbnailLongEdge = 360;
// JPEG quality 80 for a small picture to pick from, not to keep: common practice for web thumbnails, from memory
const thumbnailQuality = 80;

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

// 92 keeps grain and edges at 1:1 while staying a fraction of PNG's size: common practice, from memory
const regionJpegQuality = 92;
/** Throws a 422 naming the query field when the rectangle does not lie inside the width × height positive. */
function assertRegionInsidePositive(region: PixelRegion, width: number, height: number): void {
  const errors: FieldError[] = [];
  if (region.x + region.width > width)
    errors.push({
      path: 'query.width',
      message: `x + width is ${region.x + region.width}, past the positive's width of ${width} pixels`,
    });
  if (region.y + region.height > height)
    errors.push({
      path: 'query.height',
      message: `y + height is ${region.y + region.height}, past the positive's height of ${height} pixels`,
    });
  if (errors.length)
    throw new AppError(
      'region-outside-positive',
      422,
      `The rectangle must lie inside the ${width} × ${height} positive.`,
      errors,
    );
}

/** One frame: its record, previews and finished outputs. */
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
      summary:
        'The positive as a JPEG, long edge 2048 (404 until rendered; for its customer once the order is released)',
    },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      await assertCustomerMayGet(db, user!, { frameId: frame.id, kind: 'preview' });
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
      const preview = await negativePreviewOf(db, store, frame, clock.now());
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
      summary:
        'A finished positive: jpeg, tiff16 or png16 (404 until rendered; for its customer once the order is released)',
    },
    async (_req, res, { params, query, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      await assertCustomerMayGet(db, user!, { frameId: frame.id, kind: 'full-size' });
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
      // the output keeps its address when the frame renders again: the browser asks each time, by the bytes' hash
      res.set('ETag', `"${output.sha256}"`);
      res.set('Cache-Control', 'private, no-cache');
      res.type(output.media_type);
      res.attachment(`${stem}${POSITIVE_EXTENSIONS[query.format]}`);
      res.sendFile(store.pathOf(output.sha256));
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/outputs/full',
      roles: staffRoles,
      params: idParamsSchema,
      query: frameOutputRegionQuerySchema,
      summary: 'A rectangle of the full-size positive at 1:1, as PNG or JPEG (404 until rendered)',
    },
    async (req, res, { params, query, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const output = frame.status === 'done' ? await findFullSizeOutput(db, frame.id) : undefined;
      if (!output) {
        throw new AppError('output-not-ready', 404, `Frame ${frame.id} has not been inverted yet.`);
      }
      const path = store.pathOf(output.sha256);
      const { width = 0, height = 0 } = await sharp(path, { limitInputPixels: false }).metadata();
      assertRegionInsidePositive(query, width, height);
      const { x, y, format } = query;
      const etag = `"${output.sha256.slice(0, 32)}-${x}-${y}-${query.width}-${query.height}-${format}"`;
      res.set({
        ETag: etag,
        // the region keeps its address when the frame renders again: the browser asks each time, by the output's hash
        'Cache-Control': 'private, no-cache',
        [frameOutputRegionHeaders.width]: String(width),
        [frameOutputRegionHeaders.height]: String(height),
      });
      if (req.fresh) {
        res.status(304).end();
        return;
      }
      const region = sharp(path, { limitInputPixels: false })
        .extract({ left: x, top: y, width: query.width, height: query.height })
        .toColourspace('srgb');
      const bytes = await (
        format === 'png' ? region.png() : region.withIccProfile('srgb').jpeg({ quality: regionJpegQuality })
      ).toBuffer();
      res.type(format === 'png' ? 'image/png' : 'image/jpeg').send(bytes);
    },
  );
  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/thumbnail',
      roles: everyone,
      params: idParamsSchema,
      summary: 'The positive as a small JPEG for the gallery, long edge 360 (404 until rendered)',
    },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      await assertCustomerMayGet(db, user!, { frameId: frame.id, kind: 'thumbnail' });
      const preview = await findFrameOutput(db, frame.id, 'preview');
      if (!preview) {
        throw new AppError('preview-not-ready', 404, `Frame ${frame.id} has not been inverted yet.`);
      }
      const bytes = await sharp(store.pathOf(preview.sha256))
        .resize(thumbnailLongEdge, thumbnailLongEdge, { fit: 'inside', withoutEnlargement: true })
        .jpeg({ quality: thumbnailQuality })
        .toBuffer();
      res.type('image/jpeg');
      res.set('Cache-Control', 'private, max-age=3600');
      res.send(bytes);
    },
  );
};
