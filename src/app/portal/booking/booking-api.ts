import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { BookingOptions, BookVisitRequest, VisitView, WindowsResponse } from '../../../../shared/schemas/booking';
import type { VisitReason } from '../../../../shared/visits';

/** Visit requests: arrival windows, booking, reschedule and cancel (homeowner and office). */
@Injectable({ providedIn: 'root' })
export class BookingApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/booking';

  options(customerId?: string): Promise<BookingOptions> {
    return firstValueFrom(this.http.get<BookingOptions>(`${this.base}/options`, { params: customerId ? { customerId } : {} }));
  }

  windows(q: { propertyId: string; reason: VisitReason; from?: string; days?: number; visitId?: string }): Promise<WindowsResponse> {
    const params: Record<string, string> = { propertyId: q.propertyId, reason: q.reason, days: String(q.days ?? 14) };
    if (q.from) params['from'] = q.from;
    if (q.visitId) params['visitId'] = q.visitId;
    return firstValueFrom(this.http.get<WindowsResponse>(`${this.base}/windows`, { params }));
  }

  book(body: BookVisitRequest): Promise<VisitView> {
    return firstValueFrom(this.http.post<{ visit: VisitView }>(`${this.base}/visits`, body)).then((r) => r.visit);
  }

  visits(customerId?: string): Promise<VisitView[]> {
    return firstValueFrom(this.http.get<{ visits: VisitView[] }>(`${this.base}/visits`, { params: customerId ? { customerId } : {} })).then((r) => r.visits);
  }

  visit(id: string): Promise<VisitView> {
    return firstValueFrom(this.http.get<{ visit: VisitView }>(`${this.base}/visits/${id}`)).then((r) => r.visit);
  }

  reschedule(id: string, windowStart: string): Promise<VisitView> {
    return firstValueFrom(this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/reschedule`, { windowStart })).then((r) => r.visit);
  }

  cancel(id: string, reason = ''): Promise<VisitView> {
    return firstValueFrom(this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/cancel`, { reason })).then((r) => r.visit);
  }

  /** Photos go through the upload service, filed as problem photos on the property. */
  uploadPhotos(propertyId: string, files: File[]): Promise<{ id: string }[]> {
    const form = new FormData();
    form.append('propertyId', propertyId);
    form.append('category', 'problem');
    for (const f of files) form.append('files', f, f.name);
    return firstValueFrom(this.http.post<{ id: string }[]>('/api/files', form));
  }
}
