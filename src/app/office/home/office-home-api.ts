import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { OfficeHome } from '../../../../shared/schemas/home';

@Injectable({ providedIn: 'root' })
export class OfficeHomeApi {
  private readonly http = inject(HttpClient);

  load(): Observable<OfficeHome> {
    return this.http.get<OfficeHome>('/api/office-home');
  }
}
