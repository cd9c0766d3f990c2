import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';

/** What every seed step is given besides the database. */
export interface SeedContext {
  clock: Clock;
}

/** One step of the demo seed; steps run in order inside one transaction. */
export interface SeedStep {
  name: string;
  run(db: Kysely<Database>, context: SeedContext): Promise<void>;
}
