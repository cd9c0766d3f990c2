import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  CounterCustomerRequest,
  CounterCustomerResponse,
  CustomerListResponse,
  UserRecord,
} from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** Staff's calls on /api/customers: the customer accounts, and opening one at the counter. */
@Injectable({ providedIn: 'root' })
export class CustomersApi {
  private readonly http = inject(HttpClient);

  list(): Observable<UserRecord[]> {
    return this.http.get<CustomerListResponse>('/api/customers').pipe(map((r) => r.customers));
  }

  /** The server mails the customer a link to choose a password; nobody else ever knows it. */
  create(request: CounterCustomerRequest): Observable<UserRecord> {
    return this.http.post<CounterCustomerResponse>('/api/customers', request).pipe(map((r) => r.user));
  }
}
