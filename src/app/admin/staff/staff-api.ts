import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { StaffInvite, StaffMember, StaffUpdate } from '../../../../shared/schemas/auth';

@Injectable({ providedIn: 'root' })
export class StaffApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<StaffMember[]> {
    return (await firstValueFrom(this.http.get<{ items: StaffMember[] }>('/api/auth/staff'))).items;
  }
  invite(input: StaffInvite): Promise<{ userId: string; email: string }> {
    return firstValueFrom(this.http.post<{ userId: string; email: string }>('/api/auth/staff/invite', input));
  }
  update(id: string, change: StaffUpdate): Promise<StaffMember> {
    return firstValueFrom(this.http.patch<StaffMember>(`/api/auth/staff/${id}`, change));
  }
  signOutEverywhere(id: string): Promise<{ sessionsEnded: number }> {
    return firstValueFrom(this.http.post<{ sessionsEnded: number }>(`/api/auth/staff/${id}/sign-out-everywhere`, {}));
  }
}
