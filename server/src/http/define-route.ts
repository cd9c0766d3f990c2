import type { Role, User } from '@clearbase/contracts';
import express, {
  type NextFunction,
  type Request,
  type RequestHandler,
  type Response,
  type Router,
} from 'express';
import type { z } from 'zod';
import { AppError, type FieldError } from '../errors/app-error';

// The API's user under another name, so the Express namespace below can extend it.
type ApiUser = User;

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts the signed-in user here; its shape is the API's user
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends Readonly<ApiUser> {}
  }
}

/** Who may call a route: anyone, anyone signed in, or the listed roles only (no implied hierarchy). */
export type RouteAccess = 'public' | 'signed-in' | readonly Role[];

export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** Everything a route declares about itself. Paths are full paths from the root, starting with /api/. */
export interface RouteDefinition<
  B extends z.ZodType = z.ZodType,
  Q extends z.ZodType = z.ZodType,
  P extends z.ZodType = z.ZodType,
> {
  method: HttpMethod;
  path: `/api/${string}`;
  roles: RouteAccess;
  body?: B;
  query?: Q;
  params?: P;
  /** Middleware run after the access check and validation, before the handler (e.g. a rate limiter). */
  before?: RequestHandler[];
  /** One line for people reading the route table. */
  summary?: string;
}

type Parsed<S> = S extends z.ZodType ? z.output<S> : undefined;

/** What a handler receives besides req and res: the validated input and, on protected routes, the user. */
export interface RouteInput<B, Q, P> {
  body: Parsed<B>;
  query: Parsed<Q>;
  params: Parsed<P>;
  user: User | undefined;
}

export type RouteHandler<B, Q, P> = (
  req: Request,
  res: Response,
  input: RouteInput<B, Q, P>,
) => unknown | Promise<unknown>;

export interface RegisteredRoute {
  method: HttpMethod;
  path: string;
  roles: RouteAccess;
  summary?: string;
}

/** Marks handler chains built by defineRoute, so a test can tell declared routes from anything else. */
export const declaredRoute = Symbol('clearbase.declaredRoute');

/** A router that only accepts routes through `define`; the Express router underneath is not handed out. */
export interface ApiRoutes {
  define<
    B extends z.ZodType | undefined = undefined,
    Q extends z.ZodType | undefined = undefined,
    P extends z.ZodType | undefined = undefined,
  >(
    definition: RouteDefinition & { body?: B; query?: Q; params?: P },
    handler: RouteHandler<B, Q, P>,
  ): void;
  /** Every route declared so far, in order. */
  readonly registry: readonly RegisteredRoute[];
}

function fieldErrors(error: z.ZodError, where: string): FieldError[] {
  return error.issues.map((issue) => ({
    path: [where, ...issue.path.map(String)].join('.'),
    message: issue.message,
  }));
}

/** True when the user may call a route with this access. */
export function isAllowed(access: RouteAccess, user: User | undefined): boolean {
  if (access === 'public') return true;
  if (!user) return false;
  if (access === 'signed-in') return true;
  return access.includes(user.role);
}

function accessCheck(access: RouteAccess): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    if (!req.user) return next(new AppError('sign-in-required', 401, 'Sign in to continue.'));
    if (!isAllowed(access, req.user)) {
      return next(new AppError('forbidden', 403, 'Your account does not have access to this.'));
    }
    next();
  };
}

/**
 * Creates the API's route table. Routes are registered only through `define`, which declares who may call them and
 * validates body, query and params with zod before the handler runs (schema errors answer 400 with each field's path).
 *
 * @example
 * api.define({ method: 'get', path: '/api/users', roles: ['admin'] }, async (_req, res) => res.json({ users }));
 */
export function createApiRoutes(): { api: ApiRoutes; router: Router } {
  const router = express.Router({ caseSensitive: true });
  const registry: RegisteredRoute[] = [];
  const api: ApiRoutes = {
    registry,
    define(definition, handler) {
      if (!definition.path.startsWith('/api/'))
        throw new Error(`Route paths start with /api/, got ${definition.path}`);
      const key = `${definition.method.toUpperCase()} ${definition.path}`;
      if (registry.some((r) => `${r.method.toUpperCase()} ${r.path}` === key)) {
        throw new Error(`Route ${key} is declared twice`);
      }
      const validate: RequestHandler = (req, res, next) => {
        const errors: FieldError[] = [];
        const input = { body: undefined, query: undefined, params: undefined } as Record<string, unknown>;
        for (const where of ['params', 'query', 'body'] as const) {
          const schema = definition[where];
          if (!schema) continue;
          const raw = where === 'body' ? (req.body ?? {}) : req[where];
          const result = schema.safeParse(raw);
          if (result.success) input[where] = result.data;
          else errors.push(...fieldErrors(result.error, where));
        }
        if (errors.length) {
          return next(new AppError('invalid-request', 400, 'Some fields are missing or invalid.', errors));
        }
        if (definition.body) req.body = input['body'];
        res.locals['input'] = input;
        next();
      };
      const run: RequestHandler = async (req: Request, res: Response, next: NextFunction) => {
        const input = res.locals['input'] as Record<string, unknown>;
        try {
          await handler(req, res, { ...input, user: req.user } as never);
        } catch (err) {
          next(err);
        }
      };
      Object.defineProperty(run, declaredRoute, { value: key });
      router[definition.method](
        definition.path,
        accessCheck(definition.roles),
        validate,
        ...(definition.before ?? []),
        run,
      );
      registry.push({
        method: definition.method,
        path: definition.path,
        roles: definition.roles,
        ...(definition.summary ? { summary: definition.summary } : {}),
      });
    },
  };
  return { api, router };
}
