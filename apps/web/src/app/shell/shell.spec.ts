import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { User } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { Shell } from './shell';

@Component({ template: 'page' })
class Blank {}

async function renderFor(user: User, localFakes = true) {
  TestBed.configureTestingModule({
    imports: [Shell],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([{ path: '**', component: Blank }]),
    ],
  });
  TestBed.inject(Session).load().subscribe();
  TestBed.inject(HttpTestingController).expectOne('/api/auth/me').flush(user);
  const fixture = TestBed.createComponent(Shell);
  TestBed.inject(HttpTestingController).expectOne('/api/config/client').flush({ localFakes });
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const navNames = [...root.querySelectorAll('[data-testid^="nav-"]')]
    .map((a) => a.getAttribute('data-testid'))
    .filter((id) => id !== 'nav-toggle');
  return { root, navNames };
}

describe('Shell navigation', () => {
  it('shows a customer only home, their orders, the film stocks, prices and account', async () => {
    const { navNames } = await renderFor({
      id: 2,
      email: 'cy@home.test',
      name: 'Cy Orrin',
      role: 'customer',
    });
    expect(navNames).toEqual(['nav-home', 'nav-orders', 'nav-catalogue', 'nav-prices', 'nav-account']);
  });

  it('shows an operator no admin pages', async () => {
    const { navNames } = await renderFor({
      id: 3,
      email: 'ola@lab.test',
      name: 'Ola Brandt',
      role: 'operator',
    });
    expect(navNames).not.toContain('nav-users');
    expect(navNames).not.toContain('nav-audit');
  });

  it('shows an admin the users page, the audit log, the outbox and the development mailbox', async () => {
    const { navNames } = await renderFor({ id: 1, email: 'ada@lab.test', name: 'Ada Quist', role: 'admin' });
    expect(navNames).toEqual([
      'nav-home',
      'nav-orders',
      'nav-customers',
      'nav-catalogue',
      'nav-scanners',
      'nav-calibration',
      'nav-prices',
      'nav-users',
      'nav-audit',
      'nav-outbox',
      'nav-dev-mailbox',
      'nav-account',
    ]);
  });

  it('leaves out the development mailbox when the server runs without the local fakes', async () => {
    const { navNames } = await renderFor(
      { id: 1, email: 'ada@lab.test', name: 'Ada Quist', role: 'admin' },
      false,
    );
    expect(navNames).not.toContain('nav-dev-mailbox');
    expect(navNames).toContain('nav-outbox');
  });

  it('names the user and their role in the user menu', async () => {
    const { root } = await renderFor({ id: 4, email: 'mo@lab.test', name: 'Mo Verhaal', role: 'manager' });
    const menu = root.querySelector('[data-testid="user-menu"]')?.textContent ?? '';
    expect(menu).toContain('Mo Verhaal');
    expect(menu).toContain('Lab manager');
  });
});
