import type { Adjustments, Frame, Roll, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { loadFrameFor } from '../frames/frame-access';
import {
  findFrameById,
  outputFormatsOfFrames,
  requeueFramesOfRoll,
  saveFrameAdjustments,
  toFrame,
} from '../frames/frame-repository';
import { recordOrderAudit } from '../orders/record-order-audit';
import { loadRollFor } from '../rolls/roll-access';
import { findRollById, saveRollAdjustments, toRoll } from '../rolls/roll-repository';

export type AdjustmentsService = ReturnType<typeof createAdjustmentsService>;

/**
 * Tuning of a roll and of its single frames (printer points, exposure, contrast), each change stored and audited in
 * one transaction. A change puts the frames it touches back in the queue, so the next inversion renders them again;
 * a frame being inverted keeps its state, the job in hand rendering it with what it read.
 *
 * @example const tuned = await createAdjustmentsService({ db, clock }).adjustFrame(user, frameId, { exposureStops: 1 / 3 });
 */
export function createAdjustmentsService({ db, clock }: { db: Kysely<Database>; clock: Clock }) {
  return {
    /** Sets a roll's adjustments for `actor` and queues its frames again. Throws 404 for a roll not theirs to see. */
    async adjustRoll(actor: User, rollId: number, adjustments: Adjustments): Promise<Roll> {
      const before = await loadRollFor(db, rollId, actor);
      return db.transaction().execute(async (trx) => {
        const at = clock.now();
        await saveRollAdjustments(trx, before.id, adjustments, at);
        await requeueFramesOfRoll(trx, before.id);
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'roll-adjusted',
          target: `roll:${before.id}`,
          details: { before: JSON.parse(before.adjustments), after: adjustments },
        });
        return toRoll((await findRollById(trx, before.id))!);
      });
    },

    /**
     * Sets one frame's adjustments, on top of its roll's, for `actor` and queues it again. Throws 404 for a frame not
     * theirs to see.
     */
    async adjustFrame(actor: User, frameId: number, adjustments: Adjustments): Promise<Frame> {
      const before = await loadFrameFor(db, frameId, actor);
      const frame = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        await saveFrameAdjustments(trx, before.id, adjustments, { requeue: before.status !== 'inverting' });
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'frame-adjusted',
          target: `frame:${before.id}`,
          details: { before: JSON.parse(before.adjustments), after: adjustments },
        });
        return (await findFrameById(trx, before.id))!;
      });
      const outputs = await outputFormatsOfFrames(db, [frame.id]);
      return toFrame(frame, outputs.get(frame.id));
    },
  };
}
