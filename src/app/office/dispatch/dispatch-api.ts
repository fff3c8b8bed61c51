import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
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

  board(f: BoardFilter): Promise<BoardResponse> {
    const params: Record<string, string> = { from: f.from, days: String(f.days) };
    if (f.technicianId) params['technicianId'] = f.technicianId;
    if (f.kind) params['kind'] = f.kind;
    if (f.area) params['area'] = f.area;
    return firstValueFrom(this.http.get<BoardResponse>(`${this.base}/board`, { params }));
  }

  assign(id: string, technicianId: string | null, startsAt?: string): Promise<VisitView> {
    return firstValueFrom(this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/assign`, { technicianId, ...(startsAt ? { startsAt } : {}) })).then((r) => r.visit);
  }

  setStatus(id: string, status: VisitStatus, note = ''): Promise<VisitView> {
    return firstValueFrom(this.http.post<{ visit: VisitView }>(`${this.base}/visits/${id}/status`, { status, note })).then((r) => r.visit);
  }

  history(id: string): Promise<VisitEventView[]> {
    return firstValueFrom(this.http.get<{ events: VisitEventView[] }>(`${this.base}/visits/${id}/events`)).then((r) => r.events);
  }

  households(q: string): Promise<Household[]> {
    return firstValueFrom(this.http.get<{ households: Household[] }>(`${this.base}/households`, { params: { q } })).then((r) => r.households);
  }
}
