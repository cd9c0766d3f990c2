import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  CreateStockRequest,
  FilmProcess,
  ImportProfileResponse,
  ProfileDiff,
  ProfileVersion,
  Stock,
  StockDetail,
  UpdateStockSheetRequest,
} from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** The catalogue's filters as the page holds them; empty means "any". */
export interface StockFilters {
  q: string;
  process: FilmProcess | '';
  masking: 'masked' | 'unmasked' | '';
}

/** Calls on the stock catalogue and on stock profile versions. */
@Injectable({ providedIn: 'root' })
export class CatalogueApi {
  private readonly http = inject(HttpClient);

  /** GET /api/stocks with the filters the server applies (search of name or maker, process, masking). */
  stocks(filters: StockFilters): Observable<Stock[]> {
    let params = new HttpParams();
    if (filters.q.trim()) params = params.set('q', filters.q.trim());
    if (filters.process) params = params.set('process', filters.process);
    if (filters.masking) params = params.set('masked', String(filters.masking === 'masked'));
    return this.http.get<{ stocks: Stock[] }>('/api/stocks', { params }).pipe(map((r) => r.stocks));
  }

  stock(id: number): Observable<StockDetail> {
    return this.http.get<StockDetail>(`/api/stocks/${id}`);
  }

  createStock(request: CreateStockRequest): Observable<Stock> {
    return this.http.post<{ stock: Stock }>('/api/stocks', request).pipe(map((r) => r.stock));
  }

  /** Changes a stock's sheet (notes, EI, latitude, push/pull, reciprocity exponent, handling). */
  updateSheet(id: number, sheet: UpdateStockSheetRequest): Observable<Stock> {
    return this.http.patch<{ stock: Stock }>(`/api/stocks/${id}`, sheet).pipe(map((r) => r.stock));
  }

  /** A new draft of the profile, starting from the given version's parameters. */
  newDraft(profileId: number, parentVersionId: number): Observable<ProfileVersion> {
    return this.http
      .post<{ version: ProfileVersion }>(`/api/profiles/${profileId}/versions`, { parentVersionId })
      .pipe(map((r) => r.version));
  }

  retire(versionId: number): Observable<ProfileVersion> {
    return this.http
      .post<{ version: ProfileVersion }>(`/api/profile-versions/${versionId}/retire`, null)
      .pipe(map((r) => r.version));
  }

  diff(fromVersionId: number, toVersionId: number): Observable<ProfileDiff> {
    return this.http.get<ProfileDiff>(`/api/profile-versions/${fromVersionId}/diff/${toVersionId}`);
  }

  /** Sends a profile document file; the server makes a new profile or a new draft, never overwriting. */
  importProfile(file: File): Observable<ImportProfileResponse> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.post<ImportProfileResponse>('/api/profiles/import', body);
  }

  /** Where the browser downloads a version's profile document. */
  exportUrl(versionId: number): string {
    return `/api/profile-versions/${versionId}/export`;
  }
}
