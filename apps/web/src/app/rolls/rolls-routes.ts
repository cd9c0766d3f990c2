import type { Routes } from '@angular/router';

/** A roll's page; the tuning screen adds its own route beside it. Lab staff only (set on the parent). */
export const rollsRoutes: Routes = [
  {
    path: ':id',
    title: 'Roll · Clearbase',
    loadComponent: () => import('./roll-page').then((m) => m.RollPage),
  },
];
