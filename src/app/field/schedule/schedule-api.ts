import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { VisitView, WeekResponse } from '../../../../shared/schemas/booking';
import type { VisitStatus } from '../../../../shared/visits';

@Injectable({ providedIn: 'root' })
export class ScheduleApi {
  private readonly http = inject(HttpClient);

  week(start?: string): Promise<WeekResponse> {
    return firstValueFrom(this.http.get<WeekResponse>('/api/schedule/week', { params: start ? { start } : {} }));
  }

  issueFeed(): Promise<{ url: string }> {
    return firstValueFrom(this.http.post<{ url: string }>('/api/schedule/feed-token', {}));
  }

  revokeFeed(): Promise<void> {
    return firstValueFrom(this.http.delete<void>('/api/schedule/feed-token'));
  }

  setStatus(id: string, status: VisitStatus): Promise<VisitView> {
    return firstValueFrom(this.http.post<{ visit: VisitView }>(`/api/dispatch/visits/${id}/status`, { status })).then((r) => r.visit);
  }
}
