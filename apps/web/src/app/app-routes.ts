import type { Routes } from '@angular/router';
import { authGuard } from './auth/auth-guard';
import { roleGuard } from './auth/role-guard';
import { signedOutGuard } from './auth/signed-out-guard';
import { unsavedChangesGuard } from './forms/unsaved-changes-guard';
import { staffRoles } from '@clearbase/contracts/values';

export const appRoutes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Clearbase',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./auth/sign-in-page').then((m) => m.SignInPage),
  },
  {
    path: 'sign-up',
    title: 'Create an account · Clearbase',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./signup/sign-up-page').then((m) => m.SignUpPage),
  },
  {
    path: 'verify-email',
    title: 'Confirm your e-mail address · Clearbase',
    loadComponent: () => import('./signup/verify-email-page').then((m) => m.VerifyEmailPage),
  },
  {
    path: 'forgot-password',
    title: 'Forgotten password · Clearbase',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./password-reset/forgot-password-page').then((m) => m.ForgotPasswordPage),
  },
  {
    path: 'reset-password',
    title: 'Choose a new password · Clearbase',
    loadComponent: () => import('./password-reset/reset-password-page').then((m) => m.ResetPasswordPage),
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
        path: 'prices',
        title: 'Prices · Clearbase',
        loadComponent: () => import('./prices/prices-page').then((m) => m.PricesPage),
      },
      {
        path: 'dev/mailbox',
        title: 'Development mailbox · Clearbase',
        canActivate: [roleGuard],
        data: { roles: ['admin'] },
        loadComponent: () => import('./dev-mailbox/dev-mailbox-page').then((m) => m.DevMailboxPage),
      },
      {
        path: 'catalogue/versions/:versionId',
        canActivateChild: [roleGuard],
        data: { roles: staffRoles },
        loadChildren: () =>
          import('./profile-editor/profile-editor-routes').then((m) => m.profileEditorRoutes),
      },
      {
        path: 'catalogue',
        loadChildren: () => import('./catalogue/catalogue-routes').then((m) => m.catalogueRoutes),
      },
      {
        path: 'orders/:id/gallery',
        title: 'Scans · Clearbase',
        loadComponent: () => import('./gallery/gallery-page').then((m) => m.GalleryPage),
      },
      {
        path: 'orders',
        loadChildren: () => import('./orders/orders-routes').then((m) => m.ordersRoutes),
      },
      {
        path: 'rolls/:id/tune',
        title: 'Tuning · Clearbase',
        canActivate: [roleGuard],
        data: { roles: staffRoles },
        canDeactivate: [unsavedChangesGuard],
        loadComponent: () => import('./tuning/tuning-page').then((m) => m.TuningPage),
      },
      {
        path: 'rolls',
        canActivateChild: [roleGuard],
        data: { roles: staffRoles },
        loadChildren: () => import('./rolls/rolls-routes').then((m) => m.rollsRoutes),
      },
      {
        path: 'calibration',
        canActivateChild: [roleGuard],
        data: { roles: staffRoles },
        loadChildren: () => import('./calibration/calibration-routes').then((m) => m.calibrationRoutes),
      },
      {
        path: 'customers',
        title: 'Customers · Clearbase',
        canActivate: [roleGuard],
        data: { roles: staffRoles },
        loadComponent: () => import('./admin/customers-page').then((m) => m.CustomersPage),
      },
      {
        path: 'scanners',
        title: 'Scanners · Clearbase',
        canActivate: [roleGuard],
        data: { roles: staffRoles },
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
