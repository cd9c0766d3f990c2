import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { CheckoutResponse, Payment, PaymentListResponse } from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** Paying for an order and refunding it. */
@Injectable({ providedIn: 'root' })
export class PaymentsApi {
  private readonly http = inject(HttpClient);

  /** The order's payments with its balance: the price, what was paid towards it and what is left. */
  overview(orderId: number): Observable<PaymentListResponse> {
    return this.http.get<PaymentListResponse>(`/api/orders/${orderId}/payments`);
  }

  checkout(orderId: number): Observable<CheckoutResponse> {
    return this.http.post<CheckoutResponse>(`/api/orders/${orderId}/checkout`, {});
  }

  refund(paymentId: number, amountMinor?: number): Observable<Payment> {
    return this.http
      .post<{ payment: Payment }>(
        `/api/payments/${paymentId}/refund`,
        amountMinor === undefined ? {} : { amountMinor },
      )
      .pipe(map((r) => r.payment));
  }
}
