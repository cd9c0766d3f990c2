import type { Routes } from '@angular/router';

/** The stock catalogue and each stock's page; every signed-in role may open them. */
export const catalogueRoutes: Routes = [
  {
    path: '',
    pathMatch: 'full',
    title: 'Film stocks · Clearbase',
    loadComponent: () => import('./catalogue-page').then((m) => m.CataloguePage),
  },
  {
    path: 'stocks/:id',
    title: 'Film stock · Clearbase',
    loadComponent: () => import('./stock-page').then((m) => m.StockPage),
  },
];
