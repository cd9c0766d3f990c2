import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import type { Config } from '../config/config';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import type { ApiRoutes } from './define-route';

/** What route modules may use. */
export interface RouteContext {
  db: Kysely<Database>;
  config: Config;
  clock: Clock;
  logger: Logger;
}

/** A resource's routes: declares them on `api`, the only way to add a route. */
export type RouteModule = (api: ApiRoutes, context: RouteContext) => void;
