import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { QuoteApprove, QuoteDecline, QuoteSummary, QuoteView } from '../../../../shared/schemas/pricebook';
import type { PlanSavings } from '../../../../shared/schemas/quotes';

/** The homeowner's quotes: only their own household's, never drafts. */
@Injectable({ providedIn: 'root' })
export class PortalQuotesApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/portal/quotes';

  list(): Observable<QuoteSummary[]> {
    return this.http.get<QuoteSummary[]>(this.base);
  }
  get(id: string): Observable<QuoteView> {
    return this.http.get<QuoteView>(`${this.base}/${id}`);
  }
  approve(id: string, body: QuoteApprove): Observable<QuoteView> {
    return this.http.post<QuoteView>(`${this.base}/${id}/approve`, body);
  }
  decline(id: string, body: QuoteDecline): Observable<QuoteView> {
    return this.http.post<QuoteView>(`${this.base}/${id}/decline`, body);
  }
  savings(): Observable<PlanSavings> {
    return this.http.get<PlanSavings>(`${this.base}/savings`);
  }
}
