import { labSchema, type Lab } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { RouteModule } from '../http/route-module';

/** Shown until an admin names the lab. */
const unnamedLab: Lab = { name: 'Clearbase', town: '', address: '' };

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

export const labRoutes: RouteModule = (api, { db }) => {
  api.define({ method: 'get', path: '/api/lab', roles: 'public', summary: 'The lab’s name and address' }, async (_req, res) => {
    res.json(await readLab(db));
  });
};
