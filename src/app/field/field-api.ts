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

  complete(id: string, body: CompleteVisit): Promise<CompletedVisit> {
    return firstValueFrom(this.http.post<CompletedVisit>(`${this.base}/${id}/complete`, body));
  }
}
