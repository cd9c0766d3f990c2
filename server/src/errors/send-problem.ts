import type { Problem } from '@clearbase/contracts';
import type { Response } from 'express';
import { STATUS_CODES } from 'node:http';

/** Answers with an RFC 9457 problem document (application/problem+json). */
export function sendProblem(
  res: Response,
  status: number,
  detail: string,
  extra: { code?: string; errors?: Problem['errors'] } = {},
): void {
  const body: Problem = {
    // RFC 9457 section 4.2.1: about:blank when the status says it all
    type: 'about:blank',
    title: STATUS_CODES[status] ?? 'Error',
    status,
    detail,
    instance: res.req.originalUrl,
    ...(extra.code ? { code: extra.code } : {}),
    ...(extra.errors ? { errors: extra.errors } : {}),
  };
  res.status(status).type('application/problem+json').send(JSON.stringify(body));
}
