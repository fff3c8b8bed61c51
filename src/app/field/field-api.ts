import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable } from 'rxjs';
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

  today(): Observable<{ date: string; visits: TodayVisit[] }> {
    return this.http.get<{ date: string; visits: TodayVisit[] }>(`${this.base}/today`);
  }

  visit(id: string, season?: 'cooling' | 'heating'): Observable<FieldVisit> {
    return this.http.get<FieldVisit>(`${this.base}/${id}`, { params: season ? { season } : {} });
  }

  saveReadings(id: string, body: SaveReadings): Observable<SavedReadings> {
    return this.http.put<SavedReadings>(`${this.base}/${id}/readings`, body);
  }

  saveChecklist(id: string, body: SaveChecklist): Observable<{ checklist: ChecklistSection[] }> {
    return this.http.put<{ checklist: ChecklistSection[] }>(`${this.base}/${id}/checklist`, body);
  }

  saveTroubleshooting(id: string, body: Troubleshooting): Observable<Troubleshooting> {
    return this.http.put<Troubleshooting>(`${this.base}/${id}/troubleshooting`, body);
  }

  saveNotes(id: string, body: VisitNotes): Observable<VisitNotes> {
    return this.http.put<VisitNotes>(`${this.base}/${id}/notes`, body);
  }

  /** Status changes go through dispatch, which keeps the history and tells the homeowner. */
  setStatus(visitId: string, status: 'on_the_way' | 'on_site'): Observable<unknown> {
    return this.http.post(`/api/dispatch/visits/${visitId}/status`, { status });
  }

  /** Photos go through the shared uploads API, filed against the visit. */
  uploadPhotos(visitId: string, photos: File[], category: 'problem' | 'nameplate', caption: string): Observable<StoredFile[]> {
    const form = new FormData();
    form.append('visitId', visitId);
    form.append('category', category);
    if (caption) form.append('caption', caption);
    for (const p of photos) form.append('files', p, p.name);
    return this.http.post<StoredFile[]>('/api/files', form);
  }

  complete(id: string, body: CompleteVisit): Observable<CompletedVisit> {
    return this.http.post<CompletedVisit>(`${this.base}/${id}/complete`, body);
  }
}
