import type { MeasuredBase, PixelRegion } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { FrameRow } from '../frames/frame-tables';
import type { RollRow } from '../rolls/roll-tables';
import type { FilmBaseFacts } from './film-base-facts';

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

/** What a frame's row says of its base. */
export function baseFactsOfFrame(row: Pick<FrameRow, 'base_mode' | 'base_measured'>): FilmBaseFacts {
  return { mode: row.base_mode, measured: parse<MeasuredBase>(row.base_measured) };
}

/** What a roll's row says of its base. */
export function baseFactsOfRoll(row: Pick<RollRow, 'base_mode' | 'base_measured'>): FilmBaseFacts {
  return { mode: row.base_mode, measured: parse<MeasuredBase>(row.base_measured) };
}

/** Stores a frame's base as an operator set it; which base the frame rendered with is forgotten until it renders. */
export async function saveFrameBase(
  db: Kysely<Database>,
  frameId: number,
  base: { mode: 'auto' | 'region'; region: PixelRegion | null; measured: MeasuredBase | null },
): Promise<void> {
  await db
    .updateTable('frames')
    .set({
      base_mode: base.mode,
      base_region: base.region ? JSON.stringify(base.region) : null,
      base_measured: base.measured ? JSON.stringify(base.measured) : null,
      base_source: null,
    })
    .where('id', '=', frameId)
    .execute();
}

/** Stores a roll's base as an operator set it: automatic, or a rectangle on one of its frames. */
export async function saveRollBase(
  db: Kysely<Database>,
  rollId: number,
  base: {
    mode: 'auto' | 'region';
    frameId: number | null;
    region: PixelRegion | null;
    measured: MeasuredBase | null;
  },
  at: Date,
): Promise<void> {
  await db
    .updateTable('rolls')
    .set({
      base_mode: base.mode,
      base_frame_id: base.frameId,
      base_region: base.region ? JSON.stringify(base.region) : null,
      base_measured: base.measured ? JSON.stringify(base.measured) : null,
      updated_at: at.toISOString(),
    })
    .where('id', '=', rollId)
    .execute();
}

/** Stores the base measured for a roll, leaving how it is set alone. */
export async function saveRollMeasuredBase(
  db: Kysely<Database>,
  rollId: number,
  measured: MeasuredBase | null,
): Promise<void> {
  await db
    .updateTable('rolls')
    .set({ base_measured: measured ? JSON.stringify(measured) : null })
    .where('id', '=', rollId)
    .execute();
}
