import type {
  CreateOrderRequest,
  CreateRollRequest,
  Order,
  OrderCustomer,
  OrderDetail,
  OrderQuery,
  OrderStatus,
  Roll,
  User,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Config } from '../config/config';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { readPriceList } from '../prices/price-list-store';
import { listRollsOfOrder, toRoll } from '../rolls/roll-repository';
import { findUserById } from '../users/user-repository';
import { addRollToOrder } from './add-roll-to-order';
import { moveOrder } from './move-order';
import { isStaff, loadOrderFor } from './order-access';
import { refusalOfStaffMove } from './order-status';
import { findOrderById, insertOrder, listOrderCustomers, listOrders, toOrder } from './order-repository';
import { recordOrderAudit } from './record-order-audit';

/** Whom an order is for: a customer orders for themselves, staff name the customer. */
async function customerOf(db: Kysely<Database>, actor: User, asked: number | undefined): Promise<User> {
  if (!isStaff(actor)) {
    if (asked !== undefined && asked !== actor.id) {
      throw new AppError('forbidden', 403, 'Customers place orders for themselves only.');
    }
    return actor;
  }
  if (!asked) {
    throw new AppError('invalid-request', 400, 'Name the customer the order is for.', [
      { path: 'body.customerId', message: 'Required when staff place an order' },
    ]);
  }
  const customer = await findUserById(db, asked);
  if (!customer || customer.role !== 'customer') {
    throw new AppError('customer-not-found', 404, `No customer with id ${asked}.`);
  }
  return { id: customer.id, email: customer.email, name: customer.name, role: 'customer' };
}

/**
 * Orders and their rolls: customers see and place only their own, staff see all and move orders on. An order keeps
 * the price list it was placed under; every change is audited.
 *
 * @example
 * const orders = createOrdersService({ db, clock, config });
 * const order = await orders.place(customer, { outputFormats: ['jpeg'], scanSize: 'standard', rolls: [] });
 */
export function createOrdersService({
  db,
  clock,
  config,
}: {
  db: Kysely<Database>;
  clock: Clock;
  config: Config;
}) {
  return {
    async list(actor: User, query: OrderQuery): Promise<{ orders: Order[]; total: number }> {
      const scoped = isStaff(actor) ? query : { ...query, customerId: actor.id };
      const { rows, total } = await listOrders(db, scoped);
      return { orders: rows.map(toOrder), total };
    },

    customers: (): Promise<OrderCustomer[]> => listOrderCustomers(db),

    async detail(actor: User, id: number): Promise<OrderDetail> {
      const order = await loadOrderFor(db, id, actor);
      return { order: toOrder(order), rolls: (await listRollsOfOrder(db, order.id)).map(toRoll) };
    },

    /** Places an order with its rolls, all or nothing, and mails the customer that it was received. */
    async place(actor: User, body: CreateOrderRequest): Promise<Order> {
      const customer = await customerOf(db, actor, body.customerId);
      return db.transaction().execute(async (trx) => {
        const at = clock.now();
        const { rolls, ...asked } = body;
        const row = await insertOrder(trx, {
          ...asked,
          customerId: customer.id,
          at,
          priceList: await readPriceList(trx),
        });
        for (const [i, request] of rolls.entries()) {
          await addRollToOrder(trx, { orderId: row.id, request, actor, at, path: `body.rolls.${i}` });
        }
        const order = toOrder((await findOrderById(trx, row.id))!);
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'order-created',
          target: `order:${row.id}`,
          details: { after: order },
        });
        await enqueueTemplatedMail(
          trx,
          customer.email,
          'order-received',
          {
            name: customer.name,
            reference: `order ${order.id}`,
            url: `${config.publicUrl}/orders/${order.id}`,
          },
          at,
        );
        return order;
      });
    },

    /** Staff move an order to another status, as refusalOfStaffMove allows. */
    async move(actor: User, id: number, to: OrderStatus): Promise<Order> {
      const before = await loadOrderFor(db, id, actor);
      const refused = refusalOfStaffMove(before.id, before.status, to);
      if (refused) throw refused;
      return db.transaction().execute(async (trx) => {
        const moved = await moveOrder(trx, {
          orderId: before.id,
          from: before.status,
          to,
          actor,
          at: clock.now(),
        });
        const now = (await findOrderById(trx, before.id))!;
        if (!moved && now.status !== to) {
          throw new AppError(
            'order-moved-meanwhile',
            409,
            `Order ${before.id} became ${now.status} meanwhile; reload it and choose again.`,
          );
        }
        return toOrder(now);
      });
    },

    /** Adds a roll; a customer only while the order is received, staff at any time. */
    async addRoll(actor: User, id: number, request: CreateRollRequest): Promise<Roll> {
      const order = await loadOrderFor(db, id, actor);
      if (!isStaff(actor) && order.status !== 'received') {
        throw new AppError(
          'order-in-progress',
          409,
          `Order ${order.id} is already ${order.status}; ask the lab to add a roll.`,
        );
      }
      return db
        .transaction()
        .execute((trx) =>
          addRollToOrder(trx, { orderId: order.id, request, actor, at: clock.now(), path: 'body' }),
        );
    },
  };
}
