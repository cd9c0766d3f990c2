import type { OrderStatus } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { moveOrder } from './move-order';
import { findOrderById } from './order-repository';

/** Statuses the work itself may move an order out of; from tuning on, people decide. */
const movedByWork: readonly OrderStatus[] = ['received', 'developing', 'scanning'];
/** The statuses work can move an order into, in the order it moves. */
const workOrder: readonly OrderStatus[] = ['received', 'developing', 'scanning', 'tuning'];

/**
 * The status an order's work calls for: `scanning` once any roll has a frame, `tuning` once every roll has
 * frames and all of them are inverted; `null` while no frame has arrived.
 */
async function statusOfWork(db: Kysely<Database>, orderId: number): Promise<OrderStatus | null> {
  const rolls = await db
    .selectFrom('rolls')
    .leftJoin('frames', 'frames.roll_id', 'rolls.id')
    .select((eb) => [
      'rolls.id',
      eb.fn.count<number>('frames.id').as('frames'),
      eb.fn.sum<number>(eb.case().when('frames.status', '=', 'done').then(1).else(0).end()).as('done'),
    ])
    .where('rolls.order_id', '=', orderId)
    .groupBy('rolls.id')
    .execute();
  const anyFrame = rolls.some((r) => Number(r.frames) > 0);
  if (!anyFrame) return null;
  const allDone = rolls.every((r) => Number(r.frames) > 0 && Number(r.done) === Number(r.frames));
  return allDone ? 'tuning' : 'scanning';
}

/**
 * Moves an order forward to the status its work has reached (first frame uploaded: scanning; every roll's frames
 * inverted: tuning). Never moves it backwards, never past tuning, never out of a status people set from tuning on
 * (ready, delivered, cancelled). The change is audited as the system's, with no person as actor.
 *
 * Returns the new status when the order moved, else `null`.
 * @example await advanceOrderWithWork(db, roll.order_id, clock.now()) // 'scanning' after the first upload
 */
export async function advanceOrderWithWork(
  db: Kysely<Database>,
  orderId: number,
  at: Date,
): Promise<OrderStatus | null> {
  const target = await statusOfWork(db, orderId);
  if (!target) return null;
  const earlier = workOrder.slice(0, workOrder.indexOf(target)).filter((s) => movedByWork.includes(s));
  return db.transaction().execute(async (trx) => {
    const before = await findOrderById(trx, orderId);
    if (!before || !earlier.includes(before.status)) return null;
    const moved = await moveOrder(trx, {
      orderId,
      from: before.status,
      to: target,
      actor: null,
      at,
      details: { reason: reasonFor(target) },
    });
    return moved ? target : null;
  });
}

function reasonFor(status: OrderStatus): string {
  return status === 'tuning' ? 'every roll’s frames are inverted' : 'a roll received its first scans';
}
