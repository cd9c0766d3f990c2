import { frameReviewRequestSchema, idParamsSchema, staffRoles } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { createReviewService } from './review-service';

/** The operator's decisions on rendered frames: approve, reject with a note, or exclude from delivery. */
export const reviewRoutes: RouteModule = (api, { db, clock }) => {
  const review = createReviewService({ db, clock });

  api.define(
    {
      method: 'post',
      path: '/api/frames/:id/review',
      roles: staffRoles,
      params: idParamsSchema,
      body: frameReviewRequestSchema,
      summary: 'Approve, reject (with a note) or exclude a frame',
    },
    async (_req, res, { params, body, user }) => {
      res.json(await review.decide(user!, params.id, body));
    },
  );
};
