import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { CompanySettings, CompanySettingsInput } from '../../../../shared/schemas/settings';

/** The company's own details, hours and booking rules. */
@Injectable({ providedIn: 'root' })
export class CompanySettingsApi {
  private readonly http = inject(HttpClient);

  get(): Observable<CompanySettings> {
    return this.http.get<CompanySettings>('/api/settings/company');
  }

  save(body: CompanySettingsInput): Observable<CompanySettings> {
    return this.http.put<CompanySettings>('/api/settings/company', body);
  }
}
