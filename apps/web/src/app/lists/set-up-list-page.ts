import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection, type Type } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MAT_RIPPLE_GLOBAL_OPTIONS, MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { User } from '@clearbase/contracts';
import { Session } from '../auth/session';

/**
 * For specs: configures the testing module for a page — zoneless, no animations, no ripples, a test backend and
 * an empty router — signs `user` in when given (answering the session's `/api/auth/me`), and returns the backend.
 * Ripples are off because each one asks jsdom for computed styles, a second or more over Material's stylesheets.
 *
 * @example
 * const backend = setUpListPage(ScannersPage, { id: 1, email: 'm@lab.test', name: 'Test', role: 'manager' });
 * const fixture = TestBed.createComponent(ScannersPage);
 */
export function setUpListPage(page: Type<unknown>, user?: User): HttpTestingController {
  TestBed.configureTestingModule({
    imports: [page],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      { provide: MAT_RIPPLE_GLOBAL_OPTIONS, useValue: { disabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  if (user) {
    TestBed.inject(Session).load().subscribe();
    backend.expectOne('/api/auth/me').flush(user);
  }
  return backend;
}
