import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { computed, Injectable, inject, signal } from '@angular/core';
import type { LoginRequest, LoginResponse, Role, User } from '@clearbase/contracts';
import { catchError, map, type Observable, of, tap } from 'rxjs';

/** Who is signed in, kept as a signal; sign-in, sign-out and the first "who am I" call. */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly http = inject(HttpClient);
  private readonly current = signal<User | null>(null);

  /** The signed-in user, or null. */
  readonly user = this.current.asReadonly();
  readonly signedIn = computed(() => this.current() !== null);
  readonly role = computed<Role | null>(() => this.current()?.role ?? null);

  /** GET /api/auth/me; a 401 (or no server) means nobody is signed in. Never errors. */
  load(): Observable<User | null> {
    return this.http.get<User>('/api/auth/me').pipe(
      catchError((err: unknown) => {
        if (!(err instanceof HttpErrorResponse)) console.error(err);
        return of(null);
      }),
      tap((user) => this.current.set(user)),
    );
  }

  /** POST /api/auth/login; errors (401, 429, 400) pass through for the form to show. */
  signIn(request: LoginRequest): Observable<User> {
    return this.http.post<LoginResponse>('/api/auth/login', request).pipe(
      map((res) => res.user),
      tap((user) => this.current.set(user)),
    );
  }

  /** POST /api/auth/logout; the local session ends even if the call fails. */
  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/logout', null).pipe(
      catchError(() => of(undefined)),
      map(() => undefined),
      tap(() => this.current.set(null)),
    );
  }

  /** Forgets the user without calling the server (after the server said the session is gone). */
  forget(): void {
    this.current.set(null);
  }
}
