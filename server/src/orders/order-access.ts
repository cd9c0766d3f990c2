import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { findOrderById, type OrderListRow } from './order-repository';

/** True for the lab's own people, who see every order. */
export function isStaff(user: User): boolean {
  return user.role !== 'customer';
}

export function orderNotFound(id: number): AppError {
  return new AppError('order-not-found', 404, `No order with id ${id}.`);
}

/**
 * The order if this user may see it. A customer asking for someone else's order gets the same 404 as for an order
 * that does not exist, so ids reveal nothing.
 */
export async function loadOrderFor(db: Kysely<Database>, id: number, user: User): Promise<OrderListRow> {
  const order = await findOrderById(db, id);
  if (!order || (!isStaff(user) && order.customer_id !== user.id)) throw orderNotFound(id);
  return order;
}

/** The customer who owns a roll's order, for the same check on rolls, frames and their files. */
export async function ownerOfRoll(db: Kysely<Database>, rollId: number): Promise<number | undefined> {
  const row = await db
    .selectFrom('rolls')
    .innerJoin('orders', 'orders.id', 'rolls.order_id')
    .select('orders.customer_id')
    .where('rolls.id', '=', rollId)
    .executeTakeFirst();
  return row?.customer_id;
}
