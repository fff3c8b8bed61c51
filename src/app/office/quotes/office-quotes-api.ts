import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { QuoteStats, Restock, StockLocation, StockRow, Transfer } from '../../../../shared/schemas/pricebook';
import type { PlanSavings, QuotePage } from '../../../../shared/schemas/quotes';

const params = (q: Record<string, string | number | boolean | undefined>) =>
  new HttpParams({
    fromObject: Object.fromEntries(
      Object.entries(q)
        .filter(([, v]) => v !== undefined && v !== '')
        .map(([k, v]) => [k, String(v)]),
    ),
  });

/** The office's view of quotes, savings and stock across every truck and the shop. */
@Injectable({ providedIn: 'root' })
export class OfficeQuotesApi {
  private readonly http = inject(HttpClient);

  quotes(q: { status?: string; sort?: string; dir?: string; page?: number; pageSize?: number; customerId?: string }): Observable<QuotePage> {
    return this.http.get<QuotePage>('/api/quotes', { params: params(q) });
  }
  stats(periodDays = 90): Observable<QuoteStats> {
    return this.http.get<QuoteStats>('/api/quotes/stats', { params: params({ periodDays }) });
  }
  savings(customerId: string): Observable<PlanSavings> {
    return this.http.get<PlanSavings>(`/api/quotes/savings/${customerId}`);
  }
  locations(): Observable<StockLocation[]> {
    return this.http.get<StockLocation[]>('/api/stock/locations');
  }
  stock(q: { locationId?: string; belowMinimum?: boolean; q?: string }): Observable<StockRow[]> {
    return this.http.get<StockRow[]>('/api/stock/levels', { params: params(q) });
  }
  restock(body: Restock): Observable<StockRow[]> {
    return this.http.post<StockRow[]>('/api/stock/restocks', body);
  }
  transfer(body: Transfer): Observable<StockRow[]> {
    return this.http.post<StockRow[]>('/api/stock/transfers', body);
  }
}
