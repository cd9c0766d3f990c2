import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { ActivatedRouteSnapshot, RouterStateSnapshot } from '@angular/router';
import {
  holdUnloadWithUnsavedChanges,
  unsavedChangesGuard,
  type LeavesWithCare,
} from './unsaved-changes-guard';

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

  it('asks the page’s own question', () => {
    const confirm = vi.spyOn(window, 'confirm').mockReturnValue(false);
    leave({
      hasUnsavedChanges: () => true,
      leaveQuestion: 'This roll has unsaved tuning. Leave and lose it?',
    });
    expect(confirm).toHaveBeenCalledWith('This roll has unsaved tuning. Leave and lose it?');
  });

  it('holds a tab closing only while there are unsaved edits', () => {
    const closing = () => new Event('beforeunload', { cancelable: true }) as BeforeUnloadEvent;
    const clean = closing();
    holdUnloadWithUnsavedChanges({ hasUnsavedChanges: () => false }, clean);
    expect(clean.defaultPrevented).toBe(false);
    const edited = closing();
    holdUnloadWithUnsavedChanges({ hasUnsavedChanges: () => true }, edited);
    expect(edited.defaultPrevented).toBe(true);
  });
});
