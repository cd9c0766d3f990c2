import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { AuditListResponse } from '@clearbase/contracts';
import type { Observable } from 'rxjs';

/** One page of the audit log: `limit` entries from `offset`, optionally one action only. */
export interface AuditPageRequest {
  limit: number;
  offset: number;
  action?: string;
}

/** The admin's call on /api/audit. */
@Injectable({ providedIn: 'root' })
export class AuditApi {
  private readonly http = inject(HttpClient);

  page({ limit, offset, action }: AuditPageRequest): Observable<AuditListResponse> {
    let params = new HttpParams().set('limit', limit).set('offset', offset);
    if (action) params = params.set('action', action);
    return this.http.get<AuditListResponse>('/api/audit', { params });
  }
}
