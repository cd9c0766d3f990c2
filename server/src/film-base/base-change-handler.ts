import type { User } from '@clearbase/contracts';
import type { Request, Response } from 'express';

/**
 * The one body of the routes that set a base (a roll's, a frame's): the service sets the base of `params.id` for the
 * signed-in user as the body asks, and the answer is what it returns.
 *
 * @example api.define({ method: 'put', path: '/api/rolls/:id/base', … }, baseChangeHandler(filmBase.setRollBase));
 */
export function baseChangeHandler<B>(set: (actor: User, id: number, request: B) => Promise<unknown>) {
  return async (
    _req: Request,
    res: Response,
    { params, body, user }: { params: { id: number }; body: B; user: User | undefined },
  ): Promise<void> => {
    res.json(await set(user!, params.id, body));
  };
}
