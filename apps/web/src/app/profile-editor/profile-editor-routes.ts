import type { Routes } from '@angular/router';
import { unsavedChangesGuard } from '../forms/unsaved-changes-guard';

/** The profile editor; the parent route's role guard keeps it to staff. */
export const profileEditorRoutes: Routes = [
  {
    path: '',
    title: 'Profile version · Clearbase',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./profile-editor-page').then((m) => m.ProfileEditorPage),
  },
];
