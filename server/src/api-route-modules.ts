import { auditRoutes } from './audit/audit-routes';
import { calibrationsRoutes } from './calibrations/calibrations-routes';
import { clientConfigRoutes } from './config/client-config-routes';
import { devMailboxRoutes } from './dev-mailbox/dev-mailbox-routes';
import { downloadsRoutes } from './downloads/downloads-routes';
import { markReadyRoutes } from './downloads/mark-ready-routes';
import { healthRoutes } from './health/health-routes';
import type { RouteModule } from './http/route-module';
import { paymentsRoutes } from './payments/payments-routes';
import { framesRoutes } from './frames/frames-routes';
import { frameTuningRoutes } from './frames/frame-tuning-routes';
import { galleryRoutes } from './gallery/gallery-routes';
import { jobsRoutes } from './jobs/jobs-routes';
import { labRoutes } from './lab/lab-routes';
import { ordersRoutes } from './orders/orders-routes';
import { outboxAdminRoutes } from './outbox-admin/outbox-admin-routes';
import { pricesRoutes } from './prices/prices-routes';
import { profilesRoutes } from './profiles/profiles-routes';
import { referenceFrameRoutes } from './profiles/reference-frame-routes';
import { reviewRoutes } from './review/review-routes';
import { adjustmentsRoutes } from './tuning/adjustments-routes';
import { rollsRoutes } from './rolls/rolls-routes';
import { scannersRoutes } from './scanners/scanners-routes';
import { signupRoutes } from './signup/signup-routes';
import { stocksRoutes } from './stocks/stocks-routes';
import { tuningRoutes } from './tuning/tuning-routes';
import { uploadsRoutes } from './uploads/uploads-routes';
import { usersRoutes } from './users/users-routes';

/**
 * Every resource's routes, in the order they are registered. Add a resource by appending its module; sign-in routes
 * are added by createApp because they need the app's passport instance.
 */
export const apiRouteModules: readonly RouteModule[] = [
  healthRoutes,
  clientConfigRoutes,
  labRoutes,
  usersRoutes,
  auditRoutes,
  stocksRoutes,
  scannersRoutes,
  profilesRoutes,
  referenceFrameRoutes,
  signupRoutes,
  devMailboxRoutes,
  outboxAdminRoutes,
  pricesRoutes,
  paymentsRoutes,
  ordersRoutes,
  rollsRoutes,
  uploadsRoutes,
  framesRoutes,
  frameTuningRoutes,
  jobsRoutes,
  adjustmentsRoutes,
  calibrationsRoutes,
  tuningRoutes,
  reviewRoutes,
  downloadsRoutes,
  markReadyRoutes,
  galleryRoutes,
];
