import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Order, OrderReadiness } from '@clearbase/contracts';
import type { Observable } from 'rxjs';

/** Staff hand an order over: is it ready to go, and marking it ready (which mails the customer the link). */
@Injectable({ providedIn: 'root' })
export class OrderReadinessApi {
  private readonly http = inject(HttpClient);

  /** GET /api/orders/:id/readiness: whether every roll is approved, and the rolls still waiting. */
  readiness(orderId: number): Observable<OrderReadiness> {
    return this.http.get<OrderReadiness>(`/api/orders/${orderId}/readiness`);
  }

  /** POST /api/orders/:id/ready: status `ready` and the scans-ready e-mail with a download link. */
  markReady(orderId: number): Observable<Order> {
    return this.http.post<Order>(`/api/orders/${orderId}/ready`, {});
  }
}
