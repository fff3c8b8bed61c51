import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import type { StaffInvite, StaffMember, StaffUpdate } from '../../../../shared/schemas/auth';

@Injectable({ providedIn: 'root' })
export class StaffApi {
  private readonly http = inject(HttpClient);

  list(): Observable<StaffMember[]> {
    return this.http.get<{ items: StaffMember[] }>('/api/auth/staff').pipe(map((r) => r.items));
  }
  invite(input: StaffInvite): Observable<{ userId: string; email: string }> {
    return this.http.post<{ userId: string; email: string }>('/api/auth/staff/invite', input);
  }
  update(id: string, change: StaffUpdate): Observable<StaffMember> {
    return this.http.patch<StaffMember>(`/api/auth/staff/${id}`, change);
  }
  signOutEverywhere(id: string): Observable<{ sessionsEnded: number }> {
    return this.http.post<{ sessionsEnded: number }>(`/api/auth/staff/${id}/sign-out-everywhere`, {});
  }
}
