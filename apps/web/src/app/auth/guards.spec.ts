import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import type { User } from '@clearbase/contracts';
import { authGuard } from './auth-guard';
import { roleGuard } from './role-guard';
import { Session } from './session';
import { signedOutGuard } from './signed-out-guard';

@Component({ template: 'page' })
class Blank {}

const admin: User = { id: 1, email: 'ada@lab.test', name: 'Ada Quist', role: 'admin' };
const customer: User = { id: 2, email: 'cy@home.test', name: 'Cy Orrin', role: 'customer' };

function setUp() {
  TestBed.configureTestingModule({
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([
        { path: 'sign-in', canActivate: [signedOutGuard], component: Blank },
        {
          path: '',
          canActivate: [authGuard],
          children: [
            { path: '', component: Blank },
            { path: 'account', component: Blank },
            {
              path: 'admin',
              canActivateChild: [roleGuard],
              data: { roles: ['admin'] },
              children: [{ path: 'users', component: Blank }],
            },
          ],
        },
      ]),
    ],
  });
  return { router: TestBed.inject(Router), http: TestBed.inject(HttpTestingController) };
}

function signInAs(user: User): void {
  const session = TestBed.inject(Session);
  session.load().subscribe();
  TestBed.inject(HttpTestingController).expectOne('/api/auth/me').flush(user);
}

describe('route guards', () => {
  it('sends a visitor who is not signed in to sign-in, remembering the page they asked for', async () => {
    const { router } = setUp();
    await router.navigateByUrl('/admin/users');
    expect(router.url).toBe('/sign-in?returnUrl=%2Fadmin%2Fusers');
  });

  it('lets a signed-in user reach their pages', async () => {
    const { router } = setUp();
    signInAs(customer);
    await router.navigateByUrl('/account');
    expect(router.url).toBe('/account');
  });

  it('keeps a customer out of admin pages and sends them home', async () => {
    const { router } = setUp();
    signInAs(customer);
    await router.navigateByUrl('/admin/users');
    expect(router.url).toBe('/');
  });

  it('lets an admin into admin pages', async () => {
    const { router } = setUp();
    signInAs(admin);
    await router.navigateByUrl('/admin/users');
    expect(router.url).toBe('/admin/users');
  });

  it('sends a signed-in user away from the sign-in page', async () => {
    const { router } = setUp();
    signInAs(customer);
    await router.navigateByUrl('/sign-in');
    expect(router.url).toBe('/');
  });
});
