import type { Routes } from '@angular/router';

/** Admin pages; the parent route's role guard keeps them to admins. */
export const adminRoutes: Routes = [
  { path: '', pathMatch: 'full', redirectTo: 'users' },
  {
    path: 'users',
    title: 'Users · Clearbase',
    loadComponent: () => import('./users-page').then((m) => m.UsersPage),
  },
  {
    path: 'audit',
    title: 'Audit log · Clearbase',
    loadComponent: () => import('./audit-page').then((m) => m.AuditPage),
  },
  {
    path: 'outbox',
    title: 'Outbox · Clearbase',
    loadComponent: () => import('./outbox-page').then((m) => m.OutboxPage),
  },
];
