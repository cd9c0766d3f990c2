import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { CreateScannerRequest, Scanner, UpdateScannerRequest } from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** Calls on /api/scanners: staff read, managers add and change. */
@Injectable({ providedIn: 'root' })
export class ScannersApi {
  private readonly http = inject(HttpClient);

  list(): Observable<Scanner[]> {
    return this.http.get<{ scanners: Scanner[] }>('/api/scanners').pipe(map((r) => r.scanners));
  }

  create(request: CreateScannerRequest): Observable<Scanner> {
    return this.http.post<{ scanner: Scanner }>('/api/scanners', request).pipe(map((r) => r.scanner));
  }

  update(id: number, request: UpdateScannerRequest): Observable<Scanner> {
    return this.http.patch<{ scanner: Scanner }>(`/api/scanners/${id}`, request).pipe(map((r) => r.scanner));
  }
}
