import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { HomeAccess, HomeContact, MyHome, Note, Property } from '../../../../shared/schemas/customers';

/** The homeowner's own records; the server takes the household from the session. */
@Injectable({ providedIn: 'root' })
export class MyHomeApi {
  private readonly http = inject(HttpClient);

  load(): Promise<MyHome> {
    return firstValueFrom(this.http.get<MyHome>('/api/my-home'));
  }

  updateContact(body: HomeContact | Record<string, string>): Promise<MyHome['household']> {
    return firstValueFrom(this.http.patch<MyHome['household']>('/api/my-home/contact', body));
  }

  updateAccess(propertyId: string, body: HomeAccess): Promise<Property> {
    return firstValueFrom(this.http.patch<Property>(`/api/my-home/properties/${propertyId}`, body));
  }

  addNote(propertyId: string, body: string): Promise<Note> {
    return firstValueFrom(this.http.post<Note>('/api/my-home/notes', { propertyId, body }));
  }
}
