import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable } from 'rxjs';
import type { HomeSummary } from '../../../../shared/schemas/home';
import type { HomeAccess, HomeContact, MyHome, Note, Property } from '../../../../shared/schemas/customers';

/** The homeowner's own records; the server takes the household from the session. */
@Injectable({ providedIn: 'root' })
export class MyHomeApi {
  private readonly http = inject(HttpClient);

  load(): Observable<MyHome> {
    return this.http.get<MyHome>('/api/my-home');
  }

  /** The first screen: plan, tune-ups left, next visit and what is owed. */
  summary(): Observable<HomeSummary> {
    return this.http.get<HomeSummary>('/api/my-home/summary');
  }

  updateContact(body: HomeContact | Record<string, string>): Observable<MyHome['household']> {
    return this.http.patch<MyHome['household']>('/api/my-home/contact', body);
  }

  updateAccess(propertyId: string, body: HomeAccess): Observable<Property> {
    return this.http.patch<Property>(`/api/my-home/properties/${propertyId}`, body);
  }

  addNote(propertyId: string, body: string): Observable<Note> {
    return this.http.post<Note>('/api/my-home/notes', { propertyId, body });
  }
}
