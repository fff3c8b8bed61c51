import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ReminderKind } from '../../../../shared/seasonal-reminders';
import type { ReminderCampaignSummary, ReminderPreview } from '../../../../shared/schemas/campaigns';

@Injectable({ providedIn: 'root' })
export class RemindersApi {
  private readonly http = inject(HttpClient);

  preview(kind: ReminderKind): Observable<ReminderPreview> {
    return this.http.get<ReminderPreview>('/api/reminders/preview', { params: { kind } });
  }

  send(kind: ReminderKind, expectedCount: number): Observable<ReminderCampaignSummary> {
    return this.http.post<ReminderCampaignSummary>('/api/reminders/campaigns', { kind, expectedCount });
  }

  campaign(id: string): Observable<ReminderCampaignSummary> {
    return this.http.get<ReminderCampaignSummary>(`/api/reminders/campaigns/${id}`);
  }

  campaigns(): Observable<{ campaigns: ReminderCampaignSummary[] }> {
    return this.http.get<{ campaigns: ReminderCampaignSummary[] }>('/api/reminders/campaigns');
  }
}
