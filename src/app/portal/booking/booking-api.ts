import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import type { BookingOptions, BookVisitRequest, VisitView, WindowsResponse } from '../../../../shared/schemas/booking';
import type { VisitReason } from '../../../../shared/visits';

/** Visit requests: arrival windows, booking, reschedule and cancel (homeowner and office). */
@Injectable({ providedIn: 'root' })
export class BookingApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/booking';

  options(customerId?: string): Observable<BookingOptions> {
    return this.http.get<BookingOptions>(`${this.base}/options`, { params: customerId ? { customerId } : {} });
  }

  windows(q: { propertyId: string; reason: VisitReason; from?: string; days?: number; visitId?: string }): Observable<WindowsResponse> {
    const params: Record<string, string> = { propertyId: q.propertyId, reason: q.reason, days: String(q.days ?? 14) };
    if (q.from) params['from'] = q.from;
    if (q.visitId) params['visitId'] = q.visitId;
    return this.http.get<WindowsResponse>(`${this.base}/windows`, { params });
  }

  book(body: BookVisitRequest): Observable<VisitView> {
    return this.http.post<{ visit: VisitView }>(`${this.base}/visits`, body).pipe(map((r) => r.visit));
  }

  visits(customerId?: string): Observable<VisitView[]> {
    return this.http.get<{ visits: VisitView[] }>(`${this.base}/visits`, { params: customerId ? { customerId } : {} }).pipe(map((r) => r.visits));
  }

  visit(id: string): Observable<VisitView> {
    return this.http.get<{ visit: VisitView }>(`${this.base}/visits/${id}`).pipe(map((r) => r.visit));
  }

  reschedule(id: string, windowStart: string): Observable<VisitView> {
    return this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/reschedule`, { windowStart }).pipe(map((r) => r.visit));
  }

  cancel(id: string, reason = ''): Observable<VisitView> {
    return this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/cancel`, { reason }).pipe(map((r) => r.visit));
  }

  /** Photos go through the upload service, filed as problem photos on the property. */
  uploadPhotos(propertyId: string, files: File[]): Observable<{ id: string }[]> {
    const form = new FormData();
    form.append('propertyId', propertyId);
    form.append('category', 'problem');
    for (const f of files) form.append('files', f, f.name);
    return this.http.post<{ id: string }[]>('/api/files', form);
  }
}
