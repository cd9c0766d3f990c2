import { idParamsSchema, staffRoles, type GalleryResponse } from '@clearbase/contracts';
import { customerFileAccess } from '../downloads/customer-file-access';
import { finishedFramesOfOrder } from '../downloads/finished-frames';
import { loadFileRelease } from '../downloads/load-file-release';
import type { RouteModule } from '../http/route-module';
import { isStaff, loadOrderFor } from '../orders/order-access';

const everyone = ['customer', ...staffRoles] as const;

/** An order's gallery of finished scans, for its owner or staff (the thumbnails are served from frames/). */
export const galleryRoutes: RouteModule = (api, { db }) => {
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
};
