import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { MyReminders, ReminderPreferences } from '../../../../shared/schemas/campaigns';

@Injectable({ providedIn: 'root' })
export class MyRemindersApi {
  private readonly http = inject(HttpClient);

  due(): Observable<MyReminders> {
    return this.http.get<MyReminders>('/api/my-reminders');
  }

  filterChanged(equipmentId: string): Observable<MyReminders> {
    return this.http.post<MyReminders>('/api/my-reminders/filter-changed', { equipmentId });
  }

  savePreferences(prefs: ReminderPreferences): Observable<ReminderPreferences> {
    return this.http.put<ReminderPreferences>('/api/my-reminders/preferences', prefs);
  }
}
