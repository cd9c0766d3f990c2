import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { CaughtMail, CaughtMailList, CaughtMailSummary } from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** The admin's view of what the local mail catcher caught. */
@Injectable({ providedIn: 'root' })
export class DevMailboxApi {
  private readonly http = inject(HttpClient);

  list(): Observable<CaughtMailSummary[]> {
    return this.http.get<CaughtMailList>('/api/dev/mailbox').pipe(map((r) => r.messages));
  }

  get(id: string): Observable<CaughtMail> {
    return this.http.get<CaughtMail>(`/api/dev/mailbox/${encodeURIComponent(id)}`);
  }
}
