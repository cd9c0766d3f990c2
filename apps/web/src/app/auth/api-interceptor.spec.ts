import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { apiInterceptor } from './api-interceptor';
import { Session } from './session';

@Component({ template: 'page' })
class Blank {}

const problem401 = {
  type: 'about:blank',
  title: 'Unauthorized',
  status: 401,
  detail: 'Sign in to continue.',
};

function setUp() {
  TestBed.configureTestingModule({
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(withInterceptors([apiInterceptor])),
      provideHttpClientTesting(),
      provideRouter([
        { path: 'sign-in', component: Blank },
        { path: 'admin/users', component: Blank },
        { path: '**', component: Blank },
      ]),
    ],
  });
  return {
    http: TestBed.inject(HttpClient),
    backend: TestBed.inject(HttpTestingController),
    router: TestBed.inject(Router),
    session: TestBed.inject(Session),
  };
}

describe('apiInterceptor', () => {
  it('on a 401 from an API call, forgets the user and goes to sign-in with the current page as return URL', async () => {
    const { http, backend, router, session } = setUp();
    session.load().subscribe();
    backend
      .expectOne('/api/auth/me')
      .flush({ id: 1, email: 'ada@lab.test', name: 'Ada Quist', role: 'admin' });
    await router.navigateByUrl('/admin/users');
    let failedWith = 0;
    http.get('/api/users').subscribe({ error: (e: { status: number }) => (failedWith = e.status) });

    backend.expectOne('/api/users').flush(problem401, { status: 401, statusText: 'Unauthorized' });
    await new Promise((r) => setTimeout(r));

    expect(failedWith).toBe(401);
    expect(session.user()).toBeNull();
    expect(router.url).toBe('/sign-in?returnUrl=%2Fadmin%2Fusers');
  });

  it('leaves a 401 from the sign-in call to the form', async () => {
    const { http, backend, router } = setUp();
    await router.navigateByUrl('/admin/users');
    http.post('/api/auth/login', { email: 'a@b.test', password: 'x' }).subscribe({ error: () => undefined });

    backend.expectOne('/api/auth/login').flush(problem401, { status: 401, statusText: 'Unauthorized' });
    await new Promise((r) => setTimeout(r));

    expect(router.url).toBe('/admin/users');
  });

  it('leaves a 401 from "who am I" alone: it only means nobody is signed in', async () => {
    const { http, backend, router } = setUp();
    await router.navigateByUrl('/admin/users');
    http.get('/api/auth/me').subscribe({ error: () => undefined });

    backend.expectOne('/api/auth/me').flush(problem401, { status: 401, statusText: 'Unauthorized' });
    await new Promise((r) => setTimeout(r));

    expect(router.url).toBe('/admin/users');
  });

  it('passes other errors through without navigating', async () => {
    const { http, backend, router } = setUp();
    await router.navigateByUrl('/admin/users');
    let failedWith = 0;
    http.get('/api/users').subscribe({ error: (e: { status: number }) => (failedWith = e.status) });

    backend
      .expectOne('/api/users')
      .flush({ title: 'Forbidden', status: 403 }, { status: 403, statusText: 'Forbidden' });
    await new Promise((r) => setTimeout(r));

    expect(failedWith).toBe(403);
    expect(router.url).toBe('/admin/users');
  });
});
