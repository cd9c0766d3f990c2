import type { Routes } from '@angular/router';
import { authGuard } from './auth/auth-guard';
import { roleGuard } from './auth/role-guard';
import { signedOutGuard } from './auth/signed-out-guard';

export const appRoutes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Clearbase',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./auth/sign-in-page').then((m) => m.SignInPage),
  },
  {
    path: '',
    canActivate: [authGuard],
    loadComponent: () => import('./shell/shell').then((m) => m.Shell),
    children: [
      {
        path: '',
        pathMatch: 'full',
        title: 'Home · Clearbase',
        loadComponent: () => import('./home/home-page').then((m) => m.HomePage),
      },
      {
        path: 'account',
        title: 'Account · Clearbase',
        loadComponent: () => import('./account/account-page').then((m) => m.AccountPage),
      },
      {
        path: 'catalogue/versions/:versionId',
        canActivateChild: [roleGuard],
        data: { roles: ['operator', 'manager', 'admin'] },
        loadChildren: () =>
          import('./profile-editor/profile-editor-routes').then((m) => m.profileEditorRoutes),
      },
      {
        path: 'catalogue',
        loadChildren: () => import('./catalogue/catalogue-routes').then((m) => m.catalogueRoutes),
      },
      {
        path: 'scanners',
        title: 'Scanners · Clearbase',
        canActivate: [roleGuard],
        data: { roles: ['operator', 'manager', 'admin'] },
        loadComponent: () => import('./scanners/scanners-page').then((m) => m.ScannersPage),
      },
      {
        path: 'admin',
        canActivateChild: [roleGuard],
        data: { roles: ['admin'] },
        loadChildren: () => import('./admin/admin-routes').then((m) => m.adminRoutes),
      },
    ],
  },
  { path: '**', redirectTo: '' },
];
