import type { Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '../db/database';

/** The settings key that holds the calibration rolls on file, as one JSON array. */
export const calibrationRollsSettingsKey = 'calibration-rolls-on-file';

const frameOnFileSchema = z.object({
  /** 1 … bracket, then chart, then leader: the order the calibration page loads them in. */
  n: z.int().positive(),
  role: z.enum(['bracket', 'chart', 'leader']),
  fileId: z.int().positive(),
  fileName: z.string().min(1),
  width: z.int().positive(),
  height: z.int().positive(),
  /** Bracket frames: the exposure in stops from the metered one, as written on the roll's sheet. */
  stops: z.number().nullable(),
});
export type CalibrationFrameOnFile = z.infer<typeof frameOnFileSchema>;

const rollOnFileSchema = z.object({
  id: z.int().positive(),
  stockId: z.int().positive(),
  scannerId: z.int().positive().nullable(),
  /** What the lab calls the roll, e.g. "Trial roll, bench 1". */
  title: z.string().min(1),
  note: z.string(),
  frames: z.array(frameOnFileSchema),
  createdAt: z.string(),
});

/**
 * A calibration roll whose frames are already in the file store, with each grey frame's stops, waiting for an
 * operator to mark it and fit it on the calibration page.
 */
export type CalibrationRollOnFile = z.infer<typeof rollOnFileSchema>;

const rollsOnFileSchema = z.array(rollOnFileSchema);

/** The calibration rolls on file, oldest first; a setting that no longer reads as rolls counts as none. */
export async function listCalibrationRollsOnFile(db: Kysely<Database>): Promise<CalibrationRollOnFile[]> {
  const row = await db
    .selectFrom('settings')
    .select('value')
    .where('key', '=', calibrationRollsSettingsKey)
    .executeTakeFirst();
  if (!row) return [];
  let json: unknown;
  try {
    json = JSON.parse(row.value);
  } catch {
    return [];
  }
  const parsed = rollsOnFileSchema.safeParse(json);
  return parsed.success ? parsed.data : [];
}

/**
 * Puts a roll on file under the next free id.
 *
 * @example
 * const roll = await addCalibrationRollOnFile(trx, { stockId, scannerId: null, title: 'Trial roll', note: '', frames, createdAt });
 */
export async function addCalibrationRollOnFile(
  db: Kysely<Database>,
  roll: Omit<CalibrationRollOnFile, 'id'>,
): Promise<CalibrationRollOnFile> {
  const rolls = await listCalibrationRollsOnFile(db);
  const added = rollOnFileSchema.parse({ ...roll, id: Math.max(0, ...rolls.map((r) => r.id)) + 1 });
  const value = JSON.stringify([...rolls, added]);
  await db
    .insertInto('settings')
    .values({ key: calibrationRollsSettingsKey, value })
    .onConflict((oc) => oc.column('key').doUpdateSet({ value }))
    .execute();
  return added;
}
