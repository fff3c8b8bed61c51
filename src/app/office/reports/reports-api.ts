import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { Report, ReportName, ReportQuery } from '../../../../shared/schemas/reports';

@Injectable({ providedIn: 'root' })
export class ReportsApi {
  private readonly http = inject(HttpClient);

  load<N extends ReportName>(name: N, q: ReportQuery): Observable<Report<N>> {
    return this.http.get<Report<N>>(`/api/reports/${name}`, { params: { ...q } });
  }

  /** The CSV download: a plain link, so the browser saves the file with the session cookie. */
  csvUrl(name: ReportName, q: ReportQuery): string {
    return `/api/reports/${name}/export.csv?${new URLSearchParams({ ...q }).toString()}`;
  }
}
