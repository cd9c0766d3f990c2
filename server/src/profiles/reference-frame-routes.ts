import { referenceNegativeHeaders, staffRoles, type ProfileDocument } from '@clearbase/contracts';
import { z } from 'zod';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { sendRawPixels } from '../http/send-raw-pixels';
import { findStockById } from '../stocks/stock-repository';
import { generateReferenceNegative } from './generate-reference-negative';
import { findProfileById, findVersionById } from './profile-repository';
import { REFERENCE_SIZE } from './reference-negative';
import { createReferenceNegativeCache } from './reference-negative-cache';

const idParams = z.object({ id: z.coerce.number().int().positive('Expected a positive version id') });

/**
 * The reference negative a profile version previews on: raw little-endian 16-bit RGB, interleaved, row by row, with
 * its size and film base in headers.
 */
export const referenceFrameRoutes: RouteModule = (api, { db }) => {
  // made on a worker thread: the forward model would otherwise hold the event loop for seconds
  const referenceFor = createReferenceNegativeCache(REFERENCE_SIZE, generateReferenceNegative);

  api.define(
    {
      method: 'get',
      path: '/api/profile-versions/:id/reference-negative',
      roles: staffRoles,
      params: idParams,
      summary: 'A 16-bit reference negative of the version’s stock and crosstalk, for previews',
    },
    async (_req, res, { params }) => {
      const version = await findVersionById(db, params.id);
      if (!version)
        throw new AppError('profile-version-not-found', 404, `No profile version with id ${params.id}.`);
      const profile = await findProfileById(db, version.profile_id);
      const stock = profile && (await findStockById(db, profile.stock_id));
      if (!stock) throw new AppError('stock-not-found', 404, `The stock of version ${params.id} is gone.`);
      const { crosstalk } = JSON.parse(version.parameters) as ProfileDocument;
      const negative = await referenceFor({ stock, crosstalk });
      sendRawPixels(res, {
        pixels: negative.data,
        // a draft's crosstalk may change under the same address; a published version's never does
        cacheControl: version.status === 'draft' ? 'private, no-cache' : 'private, max-age=3600',
        headers: {
          [referenceNegativeHeaders.width]: String(negative.width),
          [referenceNegativeHeaders.height]: String(negative.height),
          [referenceNegativeHeaders.base]: negative.base.map((b) => b.toPrecision(9)).join(','),
          [referenceNegativeHeaders.encoding]: negative.scanner.encoding,
        },
      });
    },
  );
};
