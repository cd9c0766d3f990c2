import {
  downloadQuerySchema,
  downloadTokenParamsSchema,
  idParamsSchema,
  outputFormatSchema,
  staffRoles,
} from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import type { RouteModule } from '../http/route-module';
import { isStaff, loadOrderFor } from '../orders/order-access';
import { findOrderById } from '../orders/order-repository';
import { assertCustomerMayGet } from './assert-customer-may-get';
import { customerFileAccess } from './customer-file-access';
import { downloadLinkValidMs, downloadUrl } from './download-link-validity';
import { findDownloadToken, insertDownloadToken } from './download-token-repository';
import { finishedFramesOfOrder } from './finished-frames';
import { loadFileRelease } from './load-file-release';
import { finishedFileName, streamOrderZip } from './order-zip';

const everyone = ['customer', ...staffRoles] as const;

const downloadFileQuerySchema = downloadQuerySchema.extend({ format: outputFormatSchema.optional() });

// one answer for a token nobody issued and for someone else's, so a link reveals nothing to the wrong person
const linkNotFound = () => new AppError('download-link-not-found', 404, 'No such download link.');

/** Signed download links and what they serve: the whole order as a zip, or one frame. */
export const downloadsRoutes: RouteModule = (api, { db, config, clock }) => {
  const store = createFileStore(config.dataDir);

  api.define(
    {
      method: 'post',
      path: '/api/orders/:id/download-links',
      roles: everyone,
      params: idParamsSchema,
      summary:
        'A signed link to the order’s finished scans, for its owner once released (ready and paid) or staff; expires after DOWNLOAD_LINK_HOURS',
    },
    async (_req, res, { params, user }) => {
      const order = await loadOrderFor(db, params.id, user!);
      await assertCustomerMayGet(db, user!, { orderId: order.id, kind: 'full-size' });
      const { token, expiresAt } = await insertDownloadToken(db, {
        orderId: order.id,
        by: user!.id,
        at: clock.now(),
        validMs: downloadLinkValidMs(config.downloadLinkHours),
      });
      res.status(201).json({ url: downloadUrl(config.publicUrl, token), expiresAt });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/downloads/:token',
      roles: everyone,
      params: downloadTokenParamsSchema,
      query: downloadFileQuerySchema,
      summary:
        'The order’s finished scans as a zip streamed as it is read, or ?frame=ID one file (owner once released, or staff)',
    },
    async (_req, res, { params, query, user }) => {
      const link = await findDownloadToken(db, params.token);
      if (!link) throw linkNotFound();
      const order = await findOrderById(db, link.order_id);
      if (!order || (!isStaff(user!) && order.customer_id !== user!.id)) throw linkNotFound();
      if (new Date(link.expires_at).getTime() <= clock.now().getTime()) {
        throw new AppError(
          'download-link-expired',
          410,
          `This download link expired at ${link.expires_at}; open the order’s gallery for a fresh one.`,
        );
      }
      await assertCustomerMayGet(db, user!, { orderId: order.id, kind: 'full-size' });
      let frames = await finishedFramesOfOrder(db, order.id);
      if (!isStaff(user!)) {
        const { state } = await loadFileRelease(db, order);
        frames = frames.filter((f) => customerFileAccess(state, f.decision, 'full-size').allowed);
      }
      if (query.frame !== undefined) {
        const frame = frames.find((f) => f.id === query.frame);
        if (!frame) {
          throw new AppError(
            'frame-not-found',
            404,
            `Order ${order.id} has no finished frame ${query.frame}.`,
          );
        }
        const output = query.format ? frame.outputs.find((o) => o.format === query.format) : frame.outputs[0];
        if (!output) {
          throw new AppError(
            'output-not-ready',
            404,
            `Frame ${frame.id} was not rendered as ${query.format}.`,
          );
        }
        res.type(output.mediaType);
        res.attachment(finishedFileName(frame, output.format).replace('/', '-'));
        res.set('Cache-Control', 'private, no-store');
        res.sendFile(store.pathOf(output.sha256));
        return;
      }
      if (frames.length === 0) {
        throw new AppError('no-finished-scans', 409, `Order ${order.id} has no finished scans yet.`);
      }
      streamOrderZip(res, store, frames, `order-${order.id}-scans.zip`);
    },
  );
};
