import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import type { BoardResponse, VisitEventView, VisitView } from '../../../../shared/schemas/booking';
import type { VisitKind, VisitStatus } from '../../../../shared/visits';

export interface BoardFilter {
  from: string;
  days: 1 | 7;
  technicianId?: string;
  kind?: VisitKind;
  area?: string;
}

export interface Household {
  id: string;
  name: string;
  email: string | null;
  phone: string | null;
}

@Injectable({ providedIn: 'root' })
export class DispatchApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/dispatch';

  board(f: BoardFilter): Observable<BoardResponse> {
    const params: Record<string, string> = { from: f.from, days: String(f.days) };
    if (f.technicianId) params['technicianId'] = f.technicianId;
    if (f.kind) params['kind'] = f.kind;
    if (f.area) params['area'] = f.area;
    return this.http.get<BoardResponse>(`${this.base}/board`, { params });
  }

  assign(id: string, technicianId: string | null, startsAt?: string): Observable<VisitView> {
    return this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/assign`, { technicianId, ...(startsAt ? { startsAt } : {}) }).pipe(map((r) => r.visit));
  }

  setStatus(id: string, status: VisitStatus, note = ''): Observable<VisitView> {
    return this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/status`, { status, note }).pipe(map((r) => r.visit));
  }

  history(id: string): Observable<VisitEventView[]> {
    return this.http.get<{ events: VisitEventView[] }>(`${this.base}/visits/${id}/events`).pipe(map((r) => r.events));
  }

  households(q: string): Observable<Household[]> {
    return this.http.get<{ households: Household[] }>(`${this.base}/households`, { params: { q } }).pipe(map((r) => r.households));
  }
}
