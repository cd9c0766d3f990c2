import type { ErrorRequestHandler } from 'express';
import { AppError } from './app-error';
import { sendProblem } from './send-problem';

interface BodyParserError {
  type?: string;
  status?: number;
  limit?: number;
}

/** The last middleware: every error leaves as a problem document; internals are logged, never sent. */
export function errorHandler(): ErrorRequestHandler {
  return (err: unknown, req, res, _next) => {
    if (res.headersSent) {
      res.end();
      return;
    }
    if (err instanceof AppError) {
      sendProblem(res, err.status, err.message, { code: err.code, errors: err.errors });
      return;
    }
    const parserError = err as BodyParserError;
    if (parserError?.type === 'entity.parse.failed') {
      sendProblem(res, 400, 'The request body is not valid JSON.', { code: 'malformed-json' });
      return;
    }
    if (parserError?.type === 'entity.too.large') {
      sendProblem(res, 413, `The request body is larger than the limit of ${parserError.limit} bytes.`, {
        code: 'body-too-large',
      });
      return;
    }
    if (typeof parserError?.status === 'number' && parserError.status >= 400 && parserError.status < 500) {
      sendProblem(res, parserError.status, 'The request could not be read.', { code: 'bad-request' });
      return;
    }
    req.log?.error({ err }, 'unhandled error');
    sendProblem(res, 500, 'Something went wrong on our side. Try again; if it persists, tell the lab.', {
      code: 'internal',
    });
  };
}
