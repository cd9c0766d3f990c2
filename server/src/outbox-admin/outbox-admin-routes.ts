import { recordAudit } from '../audit/audit-log';
import { outboxQuerySchema, type OutboxEntry } from '@clearbase/contracts';
import { z } from 'zod';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { findMail, listUndeliveredMail, scheduleMailNow } from '../mail/outbox-repository';
import type { OutboxRow } from '../mail/outbox-table';

// 200 rows: more undelivered mail than that means the mail server is down, which one page of rows already shows
// (our choice)
const listLimit = 200;

const idParams = z.object({ id: z.coerce.number().int().positive('Expected a positive id') });

/** An outbox row as admins see it: never its text or HTML, which may hold a link that opens an account. */
function toOutboxEntry(row: OutboxRow): OutboxEntry {
  // sent rows are never listed, and a retried row is pending by then
  const state = row.state === 'failed' ? 'failed' : 'pending';
  return {
    id: row.id,
    to: row.to_address,
    subject: row.subject,
    kind: row.kind,
    state,
    attempts: row.attempts,
    lastError: row.last_error,
    nextAttemptAt: row.state === 'failed' ? null : row.next_attempt_at,
    createdAt: row.created_at,
  };
}

/**
 * Mail the outbox could not deliver, for admins: what failed or waits for a retry, and "retry now". Unlike the
 * development mailbox, this works against the real mail server too.
 */
export const outboxAdminRoutes: RouteModule = (api, { db, clock, logger }) => {
  api.define(
    {
      method: 'get',
      path: '/api/admin/outbox',
      roles: ['admin'],
      query: outboxQuerySchema,
      summary: 'E-mail that failed or waits to be retried, newest first, without its body',
    },
    async (_req, res, { query }) => {
      const rows = await listUndeliveredMail(db, query.status, listLimit);
      res.json({ entries: rows.map(toOutboxEntry) });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/admin/outbox/:id/retry',
      roles: ['admin'],
      params: idParams,
      summary: 'Try an undelivered e-mail again now (the sender picks it up within seconds)',
    },
    async (_req, res, { params, user }) => {
      const row = await findMail(db, params.id);
      if (!row) throw new AppError('mail-not-found', 404, `No e-mail ${params.id} in the outbox.`);
      if (row.state === 'sent' || !(await scheduleMailNow(db, row.id, clock.now()))) {
        throw new AppError(
          'mail-already-sent',
          409,
          `E-mail ${row.id} to ${row.to_address} was already delivered; there is nothing to retry.`,
        );
      }
      logger.info({ outboxId: row.id, by: user!.id }, 'an admin asked to retry an e-mail now');
      await recordAudit(db, {
        at: clock.now(),
        actor: { id: user!.id, email: user!.email },
        action: 'mail-retried',
        target: `outbox:${row.id}`,
        details: { to: row.to_address, subject: row.subject },
      });
      res.status(202).json({ entry: toOutboxEntry((await findMail(db, row.id))!) });
    },
  );
};
