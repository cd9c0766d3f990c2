import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { DownloadLink, GalleryResponse } from '@clearbase/contracts';
import type { Observable } from 'rxjs';

/** Calls on an order's finished scans; the server limits a customer to their own orders. */
@Injectable({ providedIn: 'root' })
export class GalleryApi {
  private readonly http = inject(HttpClient);

  /** GET /api/orders/:id/gallery: the finished frames, in roll and frame order. */
  gallery(orderId: number): Observable<GalleryResponse> {
    return this.http.get<GalleryResponse>(`/api/orders/${orderId}/gallery`);
  }

  /** A fresh signed link to the whole order as a zip (or one frame with `?frame=ID`). */
  downloadLink(orderId: number): Observable<DownloadLink> {
    return this.http.post<DownloadLink>(`/api/orders/${orderId}/download-links`, {});
  }
}
