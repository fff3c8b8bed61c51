import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import type { VisitView, WeekResponse } from '../../../../shared/schemas/booking';
import type { VisitStatus } from '../../../../shared/visits';

@Injectable({ providedIn: 'root' })
export class ScheduleApi {
  private readonly http = inject(HttpClient);

  week(start?: string): Observable<WeekResponse> {
    return this.http.get<WeekResponse>('/api/schedule/week', { params: start ? { start } : {} });
  }

  issueFeed(): Observable<{ url: string }> {
    return this.http.post<{ url: string }>('/api/schedule/feed-token', {});
  }

  revokeFeed(): Observable<void> {
    return this.http.delete<void>('/api/schedule/feed-token');
  }

  setStatus(id: string, status: VisitStatus): Observable<VisitView> {
    return this.http.post<{ visit: VisitView }>(`/api/dispatch/visits/${id}/status`, { status }).pipe(map((r) => r.visit));
  }
}
