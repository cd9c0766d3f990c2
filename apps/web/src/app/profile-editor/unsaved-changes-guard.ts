import type { CanDeactivateFn } from '@angular/router';

/** A page that can say whether leaving it would lose edits. */
export interface LeavesWithCare {
  hasUnsavedChanges(): boolean;
}

/** Asks before leaving a page with unsaved edits; staying keeps them. */
export const unsavedChangesGuard: CanDeactivateFn<LeavesWithCare> = (page) =>
  !page.hasUnsavedChanges() || window.confirm('This draft has unsaved changes. Leave and lose them?');
