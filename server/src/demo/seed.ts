import type { Role } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { hashPassword } from '../auth/password-hash';
import type { Database } from '../db/database';
import { catalogueSeedStep } from './demo-catalogue-seed';
import { demoCalibrationSeedStep } from './demo-calibration-seed';
import { demoOrdersSeedStep } from './demo-orders-seed';
import { countUsers, insertUser } from '../users/user-repository';
import type { SeedContext, SeedStep } from './seed-step';

/** The shared password of every demo account. */
export const demoPassword = 'clearbase-demo';

/** The invented lab the demo data belongs to. */
export const demoLab = {
  name: 'Clearbase demo lab',
  town: 'Wrenmouth',
  address: '14 Kiln Row, Wrenmouth',
  payOnCollection: false,
} as const;

export const demoUsers: readonly { email: string; name: string; role: Role }[] = [
  { email: 'admin@clearbase.test', name: 'Ada Penhallow', role: 'admin' },
  { email: 'manager@clearbase.test', name: 'Morwen Tesk', role: 'manager' },
  { email: 'operator@clearbase.test', name: 'Oskar Lindqvale', role: 'operator' },
  { email: 'customer@clearbase.test', name: 'Cass Ferrow', role: 'customer' },
  { email: 'ines.marrow@clearbase.test', name: 'Ines Marrow', role: 'customer' },
  { email: 'tobiah.quell@clearbase.test', name: 'Tobiah Quell', role: 'customer' },
];

const labStep: SeedStep = {
  name: 'lab',
  async run(db) {
    await db
      .insertInto('settings')
      .values({ key: 'lab', value: JSON.stringify(demoLab) })
      .execute();
  },
};

const usersStep: SeedStep = {
  name: 'users',
  async run(db, { clock }) {
    const passwordHash = await hashPassword(demoPassword);
    for (const user of demoUsers) {
      await insertUser(db, {
        ...user,
        password_hash: passwordHash,
        created_at: clock.now().toISOString(),
        last_sign_in_at: null,
        password_changed_at: null,
      });
    }
  },
};

/** The demo seed's steps. Append a step to seed more (stocks, scanners, orders). */
export const demoSeedSteps: SeedStep[] = [
  labStep,
  usersStep,
  catalogueSeedStep,
  demoOrdersSeedStep,
  demoCalibrationSeedStep,
];

/**
 * Fills an empty database with the demo lab. A database that has any user is left untouched.
 *
 * @returns whether it seeded
 * @example
 * if (await seedDemo(db, { clock: systemClock })) console.log('demo lab ready');
 */
export async function seedDemo(
  db: Kysely<Database>,
  context: SeedContext,
  steps: readonly SeedStep[] = demoSeedSteps,
): Promise<boolean> {
  if ((await countUsers(db)) > 0) return false;
  const settings = await db.selectFrom('settings').select('key').limit(1).execute();
  if (settings.length > 0) return false;
  await db.transaction().execute(async (trx) => {
    for (const step of steps) await step.run(trx, context);
  });
  return true;
}
