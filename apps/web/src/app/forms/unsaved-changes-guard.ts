import type { CanDeactivateFn } from '@angular/router';

/** A page that can say whether leaving it would lose edits, and how to ask. */
export interface LeavesWithCare {
  hasUnsavedChanges(): boolean;
  /** The question asked before leaving, e.g. "This draft has unsaved changes. Leave and lose them?" */
  readonly leaveQuestion?: string;
}

/** Asks before leaving a page with unsaved edits; staying keeps them. */
export const unsavedChangesGuard: CanDeactivateFn<LeavesWithCare> = (page) =>
  !page.hasUnsavedChanges() ||
  window.confirm(page.leaveQuestion ?? 'This page has unsaved changes. Leave and lose them?');

/**
 * For a page's `(window:beforeunload)`: asks the browser to confirm closing or reloading the tab while there are
 * unsaved edits (browsers show their own wording).
 */
export function holdUnloadWithUnsavedChanges(page: LeavesWithCare, event: BeforeUnloadEvent): void {
  if (page.hasUnsavedChanges()) event.preventDefault();
}
