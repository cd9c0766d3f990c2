import type { Routes } from '@angular/router';

/** Building a profile from a calibration roll, and each calibration's report; staff only (guarded by the parent). */
export const calibrationRoutes: Routes = [
  {
    path: '',
    pathMatch: 'full',
    title: 'Calibration · Clearbase',
    loadComponent: () => import('./calibration-page').then((m) => m.CalibrationPage),
  },
  {
    path: ':id',
    title: 'Calibration report · Clearbase',
    loadComponent: () => import('./calibration-report-page').then((m) => m.CalibrationReportPage),
  },
];
