import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable } from 'rxjs';
import type { PropertyReadings, VisitSummary } from '../../../../shared/schemas/field';

/** The homeowner's readings history and visit summaries. */
@Injectable({ providedIn: 'root' })
export class ReadingsApi {
  private readonly http = inject(HttpClient);

  property(propertyId: string): Observable<PropertyReadings> {
    return this.http.get<PropertyReadings>(`/api/portal/readings/properties/${encodeURIComponent(propertyId)}`);
  }

  visitSummary(visitId: string): Observable<VisitSummary> {
    return this.http.get<VisitSummary>(`/api/portal/visit-summaries/${encodeURIComponent(visitId)}`);
  }
}
