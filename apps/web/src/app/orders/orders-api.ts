import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  CreateOrderRequest,
  CreateRollRequest,
  Order,
  OrderCustomer,
  OrderCustomerListResponse,
  OrderDetail,
  OrderListResponse,
  OrderStatus,
  Roll,
  UpdateOrderStatusRequest,
} from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

// 500 is the most the server lists at once (orderQuerySchema); a lab's open orders fit in it.
const pageSize = 500;

/** Calls on orders and the rolls on them; the server limits a customer to their own. */
@Injectable({ providedIn: 'root' })
export class OrdersApi {
  private readonly http = inject(HttpClient);

  /** GET /api/orders, newest first, optionally of one status. */
  list(status: OrderStatus | ''): Observable<OrderListResponse> {
    let params = new HttpParams().set('limit', pageSize);
    if (status) params = params.set('status', status);
    return this.http.get<OrderListResponse>('/api/orders', { params });
  }

  /** Places an order with its rolls in one request: the server keeps all of it or none. */
  place(request: CreateOrderRequest): Observable<Order> {
    return this.http.post<Order>('/api/orders', request);
  }

  /** Staff: the customers an order may be placed for. */
  customers(): Observable<OrderCustomer[]> {
    return this.http.get<OrderCustomerListResponse>('/api/orders/customers').pipe(map((r) => r.customers));
  }

  order(id: number): Observable<OrderDetail> {
    return this.http.get<OrderDetail>(`/api/orders/${id}`);
  }

  /** Staff move an order to another status. */
  setStatus(id: number, status: OrderStatus): Observable<Order> {
    return this.http.patch<Order>(`/api/orders/${id}`, { status } satisfies UpdateOrderStatusRequest);
  }

  /** Adds a roll; the server pins the stock's current published profile version. */
  addRoll(orderId: number, request: CreateRollRequest): Observable<Roll> {
    return this.http.post<Roll>(`/api/orders/${orderId}/rolls`, request);
  }
}
