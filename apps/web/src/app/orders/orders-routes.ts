import type { Routes } from '@angular/router';

/** The order list and each order's page; every signed-in role may open them (a customer sees their own). */
export const ordersRoutes: Routes = [
  {
    path: '',
    pathMatch: 'full',
    title: 'Orders · Clearbase',
    loadComponent: () => import('./orders-page').then((m) => m.OrdersPage),
  },
  {
    path: 'new',
    title: 'New order · Clearbase',
    loadComponent: () => import('./new-order-page').then((m) => m.NewOrderPage),
  },
  {
    path: ':id',
    title: 'Order · Clearbase',
    loadComponent: () => import('./order-page').then((m) => m.OrderPage),
  },
];
