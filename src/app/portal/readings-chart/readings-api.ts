import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { PropertyReadings, VisitSummary } from '../../../../shared/schemas/field';

/** The homeowner's readings history and visit summaries. */
@Injectable({ providedIn: 'root' })
export class ReadingsApi {
  private readonly http = inject(HttpClient);

  property(propertyId: string): Promise<PropertyReadings> {
    return firstValueFrom(this.http.get<PropertyReadings>(`/api/portal/readings/properties/${encodeURIComponent(propertyId)}`));
  }

  visitSummary(visitId: string): Promise<VisitSummary> {
    return firstValueFrom(this.http.get<VisitSummary>(`/api/portal/visit-summaries/${encodeURIComponent(visitId)}`));
  }
}
