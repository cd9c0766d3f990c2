import { labSchema, type Lab } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import type { Database } from '../db/database';
import type { RouteModule } from '../http/route-module';

/** Shown until an admin names the lab. */
const unnamedLab: Lab = { name: 'Clearbase', town: '', address: '', payOnCollection: false };

/** The lab's name and address from settings; a missing or damaged entry falls back to a neutral name. */
export async function readLab(db: Kysely<Database>): Promise<Lab> {
  const row = await db.selectFrom('settings').select('value').where('key', '=', 'lab').executeTakeFirst();
  if (!row) return unnamedLab;
  try {
    const parsed = labSchema.safeParse(JSON.parse(row.value));
    return parsed.success ? parsed.data : unnamedLab;
  } catch {
    return unnamedLab;
  }
}

export const labRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    { method: 'get', path: '/api/lab', roles: 'public', summary: 'The lab’s name and address' },
    async (_req, res) => {
      res.json(await readLab(db));
    },
  );

  api.define(
    {
      method: 'put',
      path: '/api/lab',
      roles: ['admin'],
      body: labSchema,
      summary: 'Rename the lab, change its address, or take payment on collection',
    },
    async (_req, res, { body, user }) => {
      const before = await readLab(db);
      await db.transaction().execute(async (trx) => {
        await trx
          .insertInto('settings')
          .values({ key: 'lab', value: JSON.stringify(body) })
          .onConflict((oc) => oc.column('key').doUpdateSet({ value: JSON.stringify(body) }))
          .execute();
        await recordAudit(trx, {
          at: clock.now(),
          actor: user!,
          action: 'settings-changed',
          target: 'lab',
          details: { before, after: body },
        });
      });
      res.json(body);
    },
  );
};
