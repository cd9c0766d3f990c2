import type { Request, Response } from 'express';

const running = new Set<Promise<void>>();

/**
 * Runs `work` once the response has gone out, so how long the work takes (and whether there was any) cannot be read
 * from the response time. Failures are logged on the request's logger; nobody is waiting for them.
 *
 * @example
 * afterResponse(req, res, () => mailResetLinkIfKnown(body.email));
 * res.status(202).json(checkYourMail('…'));
 */
export function afterResponse(req: Request, res: Response, work: () => Promise<void>): void {
  const done = new Promise<void>((resolve) => {
    const start = () => {
      work()
        .catch((err: unknown) => req.log?.error({ err }, 'work after the response failed'))
        .finally(resolve);
    };
    if (res.writableFinished) start();
    else res.once('close', start);
  });
  running.add(done);
  void done.finally(() => running.delete(done));
}

/** Resolves when all work handed to afterResponse so far has ended (tests, and a clean shutdown). */
export async function settleAfterResponse(): Promise<void> {
  while (running.size) await Promise.all([...running]);
}
