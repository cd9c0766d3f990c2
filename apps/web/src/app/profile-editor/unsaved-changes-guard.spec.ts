import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { ActivatedRouteSnapshot, RouterStateSnapshot } from '@angular/router';
import { unsavedChangesGuard, type LeavesWithCare } from './unsaved-changes-guard';

function leave(page: LeavesWithCare): boolean {
  TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
  return TestBed.runInInjectionContext(
    () =>
      unsavedChangesGuard(
        page,
        {} as ActivatedRouteSnapshot,
        {} as RouterStateSnapshot,
        {} as RouterStateSnapshot,
      ) as boolean,
  );
}

describe('the unsaved-changes guard', () => {
  afterEach(() => vi.restoreAllMocks());

  it('lets a page with nothing unsaved go without asking', () => {
    const confirm = vi.spyOn(window, 'confirm');
    expect(leave({ hasUnsavedChanges: () => false })).toBe(true);
    expect(confirm).not.toHaveBeenCalled();
  });

  it('asks before leaving unsaved edits, and stays when the answer is no', () => {
    const confirm = vi.spyOn(window, 'confirm').mockReturnValue(false);
    expect(leave({ hasUnsavedChanges: () => true })).toBe(false);
    expect(confirm).toHaveBeenCalledOnce();
  });

  it('leaves when the person agrees to lose the edits', () => {
    vi.spyOn(window, 'confirm').mockReturnValue(true);
    expect(leave({ hasUnsavedChanges: () => true })).toBe(true);
  });
});
