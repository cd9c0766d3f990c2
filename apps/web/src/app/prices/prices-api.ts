import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { OrderDraft, PriceList, Quote } from '@clearbase/contracts';
import type { Observable } from 'rxjs';

/** The price list and quotes. */
@Injectable({ providedIn: 'root' })
export class PricesApi {
  private readonly http = inject(HttpClient);

  get(): Observable<PriceList> {
    return this.http.get<PriceList>('/api/prices');
  }

  save(list: PriceList): Observable<PriceList> {
    return this.http.put<PriceList>('/api/prices', list);
  }

  quote(draft: OrderDraft): Observable<Quote> {
    return this.http.post<Quote>('/api/prices/quote', draft);
  }
}
