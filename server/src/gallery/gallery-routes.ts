import { idParamsSchema, staffRoles, type GalleryResponse } from '@clearbase/contracts';
import sharp from 'sharp';
import { assertCustomerMayGet } from '../downloads/assert-customer-may-get';
import { customerFileAccess } from '../downloads/customer-file-access';
import { finishedFramesOfOrder } from '../downloads/finished-frames';
import { loadFileRelease } from '../downloads/load-file-release';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import { findFrameOutput } from '../frames/frame-repository';
import { loadFrameFor } from '../frames/frame-access';
import type { RouteModule } from '../http/route-module';
import { isStaff, loadOrderFor } from '../orders/order-access';

const everyone = ['customer', ...staffRoles] as const;
/** Long edge of gallery thumbnails, pixels: two rows fit a laptop screen at four across (our choice). */
export const thumbnailLongEdge = 360;
// JPEG quality 80 for a small picture to pick from, not to keep: common practice for web thumbnails, from memory
const thumbnailQuality = 80;

/** An order's gallery of finished scans, for its owner or staff, and the thumbnails it shows. */
export const galleryRoutes: RouteModule = (api, { db, config }) => {
  const store = createFileStore(config.dataDir);

  api.define(
    {
      method: 'get',
      path: '/api/orders/:id/gallery',
      roles: everyone,
      params: idParamsSchema,
      summary:
        'The order’s finished frames with thumbnail, preview and download URLs (for its customer: approved frames, files once released)',
    },
    async (_req, res, { params, user }) => {
      const order = await loadOrderFor(db, params.id, user!);
      const { state, balance } = await loadFileRelease(db, order);
      const staff = isStaff(user!);
      const frames = (await finishedFramesOfOrder(db, order.id)).filter(
        (f) => staff || customerFileAccess(state, f.decision, 'thumbnail').allowed,
      );
      const asOrder = customerFileAccess(state, 'approved', 'full-size');
      const released = staff || asOrder.allowed;
      const body: GalleryResponse = {
        orderId: order.id,
        release: { fullSize: released, reason: released || asOrder.allowed ? null : asOrder.reason },
        balance,
        frames: frames.map((f) => ({
          id: f.id,
          rollId: f.rollId,
          rollNumber: f.rollNumber,
          index: f.index,
          fileName: f.fileName,
          width: f.width,
          height: f.height,
          thumbnailUrl: `/api/frames/${f.id}/thumbnail`,
          previewUrl: released ? `/api/frames/${f.id}/preview` : null,
          downloads: (released ? f.outputs : []).map((o) => ({
            format: o.format,
            url: `/api/frames/${f.id}/output?format=${o.format}`,
          })),
        })),
      };
      res.json(body);
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
