import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ReminderKind } from '../../../../shared/reminder-labels';
import type {
  AudienceFilter,
  CampaignRecipientEntry,
  DeliveryLogEntry,
  DeliveryPageQuery,
  HouseholdReminderEntry,
  KeysetPage,
  MessagePreview,
  ReminderCampaignSummary,
  ReminderPreview,
} from '../../../../shared/schemas/campaigns';
import type { PlanView } from '../../../../shared/schemas/plans';

function params(kind: ReminderKind, filter: AudienceFilter): Record<string, string> {
  const p: Record<string, string> = { kind };
  if (filter.plan) p['plan'] = filter.plan;
  if (filter.area) p['area'] = filter.area;
  if (filter.equipmentKind) p['equipmentKind'] = filter.equipmentKind;
  if (filter.noTuneUpThisSeason) p['noTuneUpThisSeason'] = 'true';
  return p;
}

@Injectable({ providedIn: 'root' })
export class RemindersApi {
  private readonly http = inject(HttpClient);

  preview(kind: ReminderKind, filter: AudienceFilter = {}): Observable<ReminderPreview> {
    return this.http.get<ReminderPreview>('/api/reminders/preview', { params: params(kind, filter) });
  }

  messages(kind: ReminderKind, filter: AudienceFilter = {}): Observable<{ messages: MessagePreview[] }> {
    return this.http.get<{ messages: MessagePreview[] }>('/api/reminders/preview/messages', { params: params(kind, filter) });
  }

  send(kind: ReminderKind, audience: AudienceFilter, expectedCount: number, sendAt?: string): Observable<ReminderCampaignSummary> {
    return this.http.post<ReminderCampaignSummary>('/api/reminders/campaigns', { kind, audience, expectedCount, ...(sendAt ? { sendAt } : {}) });
  }

  act(id: string, action: 'pause' | 'resume' | 'cancel'): Observable<ReminderCampaignSummary> {
    return this.http.post<ReminderCampaignSummary>(`/api/reminders/campaigns/${id}/actions`, { action });
  }

  campaign(id: string): Observable<ReminderCampaignSummary> {
    return this.http.get<ReminderCampaignSummary>(`/api/reminders/campaigns/${id}`);
  }

  deliveries(id: string): Observable<{ deliveries: DeliveryLogEntry[] }> {
    return this.http.get<{ deliveries: DeliveryLogEntry[] }>(`/api/reminders/campaigns/${id}/deliveries`);
  }

  /** One keyset page of the campaign's households and what became of each message. */
  recipients(id: string, q: DeliveryPageQuery = {}): Observable<KeysetPage<CampaignRecipientEntry>> {
    return this.http.get<KeysetPage<CampaignRecipientEntry>>(`/api/reminders/campaigns/${id}/recipients`, { params: { ...q } });
  }

  /** One keyset page of the reminders a household was sent, newest first. */
  householdSends(customerId: string, q: DeliveryPageQuery = {}): Observable<KeysetPage<HouseholdReminderEntry>> {
    return this.http.get<KeysetPage<HouseholdReminderEntry>>(`/api/reminders/households/${customerId}/sends`, { params: { ...q } });
  }

  campaigns(): Observable<{ campaigns: ReminderCampaignSummary[] }> {
    return this.http.get<{ campaigns: ReminderCampaignSummary[] }>('/api/reminders/campaigns');
  }

  plans(): Observable<{ plans: PlanView[] }> {
    return this.http.get<{ plans: PlanView[] }>('/api/plans');
  }
}
