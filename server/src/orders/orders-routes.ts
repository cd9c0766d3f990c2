import {
  createOrderRequestSchema,
  createRollRequestSchema,
  idParamsSchema,
  orderQuerySchema,
  staffRoles,
  updateOrderStatusRequestSchema,
} from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import type { RouteModule } from '../http/route-module';
import { readPriceList } from '../prices/price-list-store';
import { listRollsOfOrder, toRoll } from '../rolls/roll-repository';
import { findUserById } from '../users/user-repository';
import { addRollToOrder } from './add-roll-to-order';
import { moveOrder } from './move-order';
import { isStaff, loadOrderFor } from './order-access';
import { refusalOfStaffMove } from './order-status';
import { findOrderById, insertOrder, listOrderCustomers, listOrders, toOrder } from './order-repository';
import { recordOrderAudit } from './record-order-audit';

const everyone = ['customer', ...staffRoles] as const;

/** Orders and the rolls on them: customers see and place only their own, staff see all. */
export const ordersRoutes: RouteModule = (api, { db, clock, config }) => {
  api.define(
    {
      method: 'get',
      path: '/api/orders',
      roles: everyone,
      query: orderQuerySchema,
      summary: 'List orders, newest first (a customer’s own only)',
    },
    async (_req, res, { query, user }) => {
      const scoped = isStaff(user!) ? query : { ...query, customerId: user!.id };
      const { rows, total } = await listOrders(db, scoped);
      res.json({ orders: rows.map(toOrder), total });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/orders',
      roles: everyone,
      body: createOrderRequestSchema,
      summary: 'Place an order with its rolls, all or nothing (staff name the customer)',
    },
    async (_req, res, { body, user }) => {
      let customerId = user!.id;
      if (isStaff(user!)) {
        if (!body.customerId) {
          throw new AppError('invalid-request', 400, 'Name the customer the order is for.', [
            { path: 'body.customerId', message: 'Required when staff place an order' },
          ]);
        }
        const customer = await findUserById(db, body.customerId);
        if (!customer || customer.role !== 'customer') {
          throw new AppError('customer-not-found', 404, `No customer with id ${body.customerId}.`);
        }
        customerId = customer.id;
      } else if (body.customerId !== undefined && body.customerId !== user!.id) {
        throw new AppError('forbidden', 403, 'Customers place orders for themselves only.');
      }
      const order = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const { rolls, ...asked } = body;
        const row = await insertOrder(trx, { ...asked, customerId, at, priceList: await readPriceList(trx) });
        for (const [i, request] of rolls.entries()) {
          await addRollToOrder(trx, { orderId: row.id, request, actor: user!, at, path: `body.rolls.${i}` });
        }
        const order = toOrder((await findOrderById(trx, row.id))!);
        await recordOrderAudit(trx, {
          at,
          actor: user!,
          action: 'order-created',
          target: `order:${row.id}`,
          details: { after: order },
        });
        const customer = (await findUserById(trx, customerId))!;
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
      res.status(201).json(order);
    },
  );

  // before /api/orders/:id, which would take "customers" for an id
  api.define(
    {
      method: 'get',
      path: '/api/orders/customers',
      roles: staffRoles,
      summary: 'The customers staff may place an order for, by name',
    },
    async (_req, res) => {
      res.json({ customers: await listOrderCustomers(db) });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/orders/:id',
      roles: everyone,
      params: idParamsSchema,
      summary: 'An order with its rolls',
    },
    async (_req, res, { params, user }) => {
      const order = await loadOrderFor(db, params.id, user!);
      const rolls = await listRollsOfOrder(db, order.id);
      res.json({ order: toOrder(order), rolls: rolls.map(toRoll) });
    },
  );

  api.define(
    {
      method: 'patch',
      path: '/api/orders/:id',
      roles: staffRoles,
      params: idParamsSchema,
      body: updateOrderStatusRequestSchema,
      summary: 'Move an order to another status',
    },
    async (_req, res, { params, body, user }) => {
      const before = await loadOrderFor(db, params.id, user!);
      const refused = refusalOfStaffMove(before.id, before.status, body.status);
      if (refused) throw refused;
      const order = await db.transaction().execute(async (trx) => {
        const moved = await moveOrder(trx, {
          orderId: before.id,
          from: before.status,
          to: body.status,
          actor: user!,
          at: clock.now(),
        });
        const now = (await findOrderById(trx, before.id))!;
        if (!moved && now.status !== body.status) {
          throw new AppError(
            'order-moved-meanwhile',
            409,
            `Order ${before.id} became ${now.status} meanwhile; reload it and choose again.`,
          );
        }
        return toOrder(now);
      });
      res.json(order);
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/orders/:id/rolls',
      roles: everyone,
      params: idParamsSchema,
      body: createRollRequestSchema,
      summary: 'Add a roll; the stock’s current published profile version is pinned',
    },
    async (_req, res, { params, body, user }) => {
      const order = await loadOrderFor(db, params.id, user!);
      if (!isStaff(user!) && order.status !== 'received') {
        throw new AppError(
          'order-in-progress',
          409,
          `Order ${order.id} is already ${order.status}; ask the lab to add a roll.`,
        );
      }
      const roll = await db.transaction().execute((trx) =>
        addRollToOrder(trx, {
          orderId: order.id,
          request: body,
          actor: user!,
          at: clock.now(),
          path: 'body',
        }),
      );
      res.status(201).json(roll);
    },
  );
};
