import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { Role } from '@clearbase/contracts';
import { testDetail } from './catalogue-testing';
import { versionActions } from './version-actions';
import { VersionTimeline } from './version-timeline';

async function render(role: Role | null) {
  TestBed.configureTestingModule({
    imports: [VersionTimeline],
    providers: [provideZonelessChangeDetection(), provideRouter([])],
  });
  const fixture = TestBed.createComponent(VersionTimeline);
  fixture.componentRef.setInput('profile', testDetail.profiles[0]);
  fixture.componentRef.setInput('role', role);
  fixture.componentRef.setInput('exportUrl', (id: number) => `/api/profile-versions/${id}/export`);
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const testIds = () =>
    [...el.querySelectorAll('[data-testid]')]
      .map((e) => e.getAttribute('data-testid')!)
      .filter((t) => /^(new-draft|edit-draft|export|retire)-/.test(t));
  return { fixture, el, testIds };
}

describe('VersionTimeline', () => {
  it('lists versions newest first with their status, parent, changelog and who published', async () => {
    const { el } = await render('operator');
    const entries = [...el.querySelectorAll('li.entry')];
    expect(entries.map((e) => e.getAttribute('data-status'))).toEqual(['draft', 'published', 'retired']);
    const published = el.querySelector('[data-testid="version-101"]')!.textContent!;
    expect(published).toContain('Version 2');
    expect(published).toContain('Published');
    expect(published).toContain('from version 1');
    expect(published).toContain('Warmer shadows');
    expect(published).toContain('by Ines Varga');
  });

  it('gives an operator new drafts from every version, editing of the draft, exports, and no retiring', async () => {
    const { testIds, el } = await render('operator');
    expect(testIds().sort()).toEqual(
      [
        'edit-draft-102',
        'export-100',
        'export-101',
        'export-102',
        'new-draft-100',
        'new-draft-101',
        'new-draft-102',
      ].sort(),
    );
    expect(el.querySelector('[data-testid="edit-draft-102"]')!.getAttribute('href')).toBe(
      '/catalogue/versions/102',
    );
    expect(el.querySelector('[data-testid="export-101"]')!.getAttribute('href')).toBe(
      '/api/profile-versions/101/export',
    );
  });

  it('lets a manager retire the published version only', async () => {
    const { testIds } = await render('manager');
    expect(testIds().filter((t) => t.startsWith('retire-'))).toEqual(['retire-101']);
  });

  it('offers a customer no actions at all', async () => {
    const { testIds } = await render('customer');
    expect(testIds()).toEqual([]);
  });

  it('links a version fitted from a calibration to its calibration report, and no other', async () => {
    const { fixture, el } = await render('operator');
    fixture.componentRef.setInput('calibrations', new Map([[102, 7]]));
    await fixture.whenStable();
    const links = [...el.querySelectorAll('[data-testid^="calibration-report-"]')];
    expect(links.map((a) => a.getAttribute('data-testid'))).toEqual(['calibration-report-102']);
    expect(links[0]!.getAttribute('href')).toBe('/calibration/7');
  });

  it('tells which version to start a draft from when its button is pressed', async () => {
    const { fixture, el } = await render('operator');
    const asked: number[] = [];
    fixture.componentInstance.newDraft.subscribe((v) => asked.push(v.id));
    (el.querySelector('[data-testid="new-draft-101"]') as HTMLButtonElement).click();
    expect(asked).toEqual([101]);
  });
});

describe('versionActions', () => {
  it('keeps retiring to managers and admins, and to published versions', () => {
    expect(versionActions({ status: 'published' }, 'admin').retire).toBe(true);
    expect(versionActions({ status: 'draft' }, 'manager').retire).toBe(false);
    expect(versionActions({ status: 'retired' }, 'manager').retire).toBe(false);
    expect(versionActions({ status: 'published' }, 'operator').retire).toBe(false);
    expect(versionActions({ status: 'draft' }, null)).toEqual({
      newDraft: false,
      editDraft: false,
      export: false,
      retire: false,
    });
  });
});
