import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type {
  ChecklistSection,
  CompletedVisit,
  CompleteVisit,
  FieldVisit,
  SaveChecklist,
  SavedReadings,
  SaveReadings,
  TodayVisit,
  Troubleshooting,
  VisitNotes,
} from '../../../shared/schemas/field';
import type { StoredFile } from '../../../shared/schemas/customers';

/** The technician's visit API. Writes are PUTs of the whole record, so a retry is always safe. */
@Injectable({ providedIn: 'root' })
export class FieldApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/field/visits';

  today(): Promise<{ date: string; visits: TodayVisit[] }> {
    return firstValueFrom(this.http.get<{ date: string; visits: TodayVisit[] }>(`${this.base}/today`));
  }

  visit(id: string, season?: 'cooling' | 'heating'): Promise<FieldVisit> {
    return firstValueFrom(this.http.get<FieldVisit>(`${this.base}/${id}`, { params: season ? { season } : {} }));
  }

  saveReadings(id: string, body: SaveReadings): Promise<SavedReadings> {
    return firstValueFrom(this.http.put<SavedReadings>(`${this.base}/${id}/readings`, body));
  }

  saveChecklist(id: string, body: SaveChecklist): Promise<{ checklist: ChecklistSection[] }> {
    return firstValueFrom(this.http.put<{ checklist: ChecklistSection[] }>(`${this.base}/${id}/checklist`, body));
  }

  saveTroubleshooting(id: string, body: Troubleshooting): Promise<Troubleshooting> {
    return firstValueFrom(this.http.put<Troubleshooting>(`${this.base}/${id}/troubleshooting`, body));
  }

  saveNotes(id: string, body: VisitNotes): Promise<VisitNotes> {
    return firstValueFrom(this.http.put<VisitNotes>(`${this.base}/${id}/notes`, body));
  }

  /** Status changes go through dispatch, which keeps the history and tells the homeowner. */
  setStatus(visitId: string, status: 'on_the_way' | 'on_site'): Promise<unknown> {
    return firstValueFrom(this.http.post(`/api/dispatch/visits/${visitId}/status`, { status }));
  }

  /** Photos go through the shared uploads API, filed against the visit. */
  uploadPhotos(visitId: string, photos: File[], category: 'problem' | 'nameplate', caption: string): Promise<StoredFile[]> {
    const form = new FormData();
    form.append('visitId', visitId);
    form.append('category', category);
    if (caption) form.append('caption', caption);
    for (const p of photos) form.append('files', p, p.name);
    return firstValueFrom(this.http.post<StoredFile[]>('/api/files', form));
  }

  complete(id: string, body: CompleteVisit): Promise<CompletedVisit> {
    return firstValueFrom(this.http.post<CompletedVisit>(`${this.base}/${id}/complete`, body));
  }
}
