import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { AuditPage } from '../../../../shared/schemas/auth';

/** Sign-in and access events, newest first, paged by the server. */
@Injectable({ providedIn: 'root' })
export class AuditApi {
  private readonly http = inject(HttpClient);

  page(q: { page: number; pageSize: number; action?: string }): Observable<AuditPage> {
    return this.http.get<AuditPage>('/api/audit', { params: { page: q.page, pageSize: q.pageSize, ...(q.action ? { action: q.action } : {}) } });
  }
}
