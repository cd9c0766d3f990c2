import {
  negativesReturnSchema,
  type CreateOrderRequest,
  type NegativesReturn,
  type Order,
  type OrderCustomer,
  type OrderQuery,
  type OrderStatus,
  type OutputFormat,
  type ScanSize,
  type PriceList,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { OrderRow } from './order-tables';

/** An order row with the customer's name and its number of rolls, as lists need it. */
export type OrderListRow = OrderRow & { customer_name: string; roll_count: number };

function orderList(db: Kysely<Database>) {
  return db
    .selectFrom('orders')
    .innerJoin('users', 'users.id', 'orders.customer_id')
    .selectAll('orders')
    .select('users.name as customer_name')
    .select((eb) =>
      eb
        .selectFrom('rolls')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('rolls.order_id', '=', 'orders.id')
        .as('roll_count'),
    );
}

export async function findOrderById(db: Kysely<Database>, id: number): Promise<OrderListRow | undefined> {
  const row = await orderList(db).where('orders.id', '=', id).executeTakeFirst();
  return row ? { ...row, roll_count: Number(row.roll_count ?? 0) } : undefined;
}

/** Orders newest first; `customerId` limits them to one customer's. */
export async function listOrders(
  db: Kysely<Database>,
  query: OrderQuery,
): Promise<{ rows: OrderListRow[]; total: number }> {
  let base = db.selectFrom('orders');
  let list = orderList(db);
  if (query.status) {
    base = base.where('orders.status', '=', query.status);
    list = list.where('orders.status', '=', query.status);
  }
  if (query.customerId) {
    base = base.where('orders.customer_id', '=', query.customerId);
    list = list.where('orders.customer_id', '=', query.customerId);
  }
  const [rows, count] = await Promise.all([
    list.orderBy('orders.id', 'desc').limit(query.limit).offset(query.offset).execute(),
    base.select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow(),
  ]);
  return { rows: rows.map((r) => ({ ...r, roll_count: Number(r.roll_count ?? 0) })), total: Number(count.n) };
}

/** Customers whose accounts are open, by name: those staff may place an order for. */
export function listOrderCustomers(db: Kysely<Database>): Promise<OrderCustomer[]> {
  return db
    .selectFrom('users')
    .select(['id', 'name', 'email'])
    .where('role', '=', 'customer')
    .where('disabled', '=', 0)
    .orderBy('name')
    .orderBy('id')
    .execute();
}

/** Inserts the order alone; its rolls are inserted by the caller in the same transaction. */
export function insertOrder(
  db: Kysely<Database>,
  order: Omit<CreateOrderRequest, 'customerId' | 'rolls' | 'negatives'> & {
    customerId: number;
    at: Date;
    /** collected at the lab when not given */
    negatives?: NegativesReturn;
    /** the price list the order is placed under, which prices it from then on */
    priceList: PriceList;
  },
): Promise<OrderRow> {
  const at = order.at.toISOString();
  return db
    .insertInto('orders')
    .values({
      customer_id: order.customerId,
      status: 'received',
      notes: order.notes,
      output_formats: JSON.stringify(order.outputFormats),
      scan_size: order.scanSize,
      negatives: JSON.stringify(order.negatives ?? { method: 'collect' }),
      price_list: JSON.stringify(order.priceList),
      created_at: at,
      updated_at: at,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** Sets an order's status if it is still `from`; false when it was not (another change came first). */
export async function setOrderStatusIf(
  db: Kysely<Database>,
  id: number,
  from: OrderStatus,
  to: OrderStatus,
  at: Date,
): Promise<boolean> {
  const result = await db
    .updateTable('orders')
    .set({ status: to, updated_at: at.toISOString() })
    .where('id', '=', id)
    .where('status', '=', from)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

export function toOrder(row: OrderListRow): Order {
  return {
    id: row.id,
    customerId: row.customer_id,
    customerName: row.customer_name,
    status: row.status,
    notes: row.notes,
    outputFormats: JSON.parse(row.output_formats) as OutputFormat[],
    scanSize: row.scan_size as ScanSize,
    rollCount: row.roll_count,
    negatives: readNegatives(row.negatives),
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/** The stored negatives' return; a value that no longer parses reads as kept at the lab, the safe default. */
export function readNegatives(json: string): NegativesReturn {
  try {
    const parsed = negativesReturnSchema.safeParse(JSON.parse(json));
    return parsed.success ? parsed.data : { method: 'collect' };
  } catch {
    return { method: 'collect' };
  }
}
