import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  CheckYourMailResponse,
  PasswordResetConfirm,
  SignupRequest,
  VerifyEmailResponse,
} from '@clearbase/contracts';
import type { Observable } from 'rxjs';

/** The signed-out visitor's calls: sign-up, confirming the address, and choosing a new password. */
@Injectable({ providedIn: 'root' })
export class SignupApi {
  private readonly http = inject(HttpClient);

  signUp(request: SignupRequest): Observable<CheckYourMailResponse> {
    return this.http.post<CheckYourMailResponse>('/api/auth/signup', request);
  }

  resendVerification(email: string): Observable<CheckYourMailResponse> {
    return this.http.post<CheckYourMailResponse>('/api/auth/signup/resend', { email });
  }

  verify(token: string): Observable<VerifyEmailResponse> {
    return this.http.post<VerifyEmailResponse>('/api/auth/signup/verify', { token });
  }

  requestPasswordReset(email: string): Observable<CheckYourMailResponse> {
    return this.http.post<CheckYourMailResponse>('/api/auth/password-reset', { email });
  }

  confirmPasswordReset(request: PasswordResetConfirm): Observable<{ email: string }> {
    return this.http.post<{ email: string }>('/api/auth/password-reset/confirm', request);
  }
}
