import {
  createOrderRequestSchema,
  createRollRequestSchema,
  idParamsSchema,
  orderQuerySchema,
  staffRoles,
  updateOrderStatusRequestSchema,
} from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { createOrdersService } from './orders-service';

const everyone = ['customer', ...staffRoles] as const;

/** Orders and the rolls on them (the rules are in orders-service.ts). */
export const ordersRoutes: RouteModule = (api, { db, clock, config }) => {
  const orders = createOrdersService({ db, clock, config });

  api.define(
    {
      method: 'get',
      path: '/api/orders',
      roles: everyone,
      query: orderQuerySchema,
      summary: 'List orders, newest first (a customer’s own only)',
    },
    async (_req, res, { query, user }) => {
      res.json(await orders.list(user!, query));
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
      res.status(201).json(await orders.place(user!, body));
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
      res.json({ customers: await orders.customers() });
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
      res.json(await orders.detail(user!, params.id));
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
      res.json(await orders.move(user!, params.id, body.status));
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
      res.status(201).json(await orders.addRoll(user!, params.id, body));
    },
  );
};
