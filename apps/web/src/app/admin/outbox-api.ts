import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  OutboxEntry,
  OutboxListResponse,
  OutboxRetryResponse,
  UndeliveredMailState,
} from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** The admin's calls on the outbox: mail not delivered, and "retry now". */
@Injectable({ providedIn: 'root' })
export class OutboxApi {
  private readonly http = inject(HttpClient);

  list(status: UndeliveredMailState): Observable<OutboxEntry[]> {
    return this.http
      .get<OutboxListResponse>('/api/admin/outbox', { params: new HttpParams().set('status', status) })
      .pipe(map((r) => r.entries));
  }

  retry(id: number): Observable<OutboxEntry> {
    return this.http.post<OutboxRetryResponse>(`/api/admin/outbox/${id}/retry`, {}).pipe(map((r) => r.entry));
  }
}
