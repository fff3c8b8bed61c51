import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ReplacementResult } from '../../../../shared/part-matching';
import type { InvoiceView } from '../../../../shared/schemas/billing';
import type {
  DirectInvoice,
  FlatRateTask,
  PriceBookPage,
  QuoteApprove,
  QuoteCreate,
  QuoteDecline,
  QuoteOptionView,
  QuoteSend,
  QuoteUpdate,
  QuoteView,
  ReplacementSearch,
  StockLocation,
  StockRow,
} from '../../../../shared/schemas/pricebook';
import type { PartsUsed, PlanSavings, QuotePage, QuotePreview } from '../../../../shared/schemas/quotes';

type Query = Record<string, string | number | boolean | undefined>;
const params = (q: Query) => new HttpParams({ fromObject: Object.fromEntries(Object.entries(q).filter(([, v]) => v !== undefined && v !== '')) as Record<string, string> });

/** Quotes, the price book, truck stock and invoicing work, as staff on a visit use them. */
@Injectable({ providedIn: 'root' })
export class QuotesApi {
  private readonly http = inject(HttpClient);

  items(q: { q?: string; kind?: string; category?: string; pageSize?: number }): Observable<PriceBookPage> {
    return this.http.get<PriceBookPage>('/api/price-book/items', { params: params(q) });
  }

  tasks(): Observable<FlatRateTask[]> {
    return this.http.get<FlatRateTask[]>('/api/price-book/tasks');
  }

  locations(): Observable<StockLocation[]> {
    return this.http.get<StockLocation[]>('/api/stock/locations');
  }

  stock(q: { locationId?: string; belowMinimum?: boolean; q?: string }): Observable<StockRow[]> {
    return this.http.get<StockRow[]>('/api/stock/levels', { params: params(q) });
  }

  replacements(body: ReplacementSearch): Observable<ReplacementResult> {
    return this.http.post<ReplacementResult>('/api/stock/replacements', body);
  }

  partsUsed(visitId: string, body: PartsUsed): Observable<StockRow[]> {
    return this.http.post<StockRow[]>(`/api/stock/visits/${visitId}/parts-used`, body);
  }

  quotesOf(visitId: string): Observable<QuotePage> {
    return this.http.get<QuotePage>('/api/quotes', { params: params({ visitId, pageSize: 20 }) });
  }

  quote(id: string): Observable<QuoteView> {
    return this.http.get<QuoteView>(`/api/quotes/${id}`);
  }

  preview(body: QuoteCreate): Observable<QuotePreview> {
    return this.http.post<QuotePreview>('/api/quotes/preview', body);
  }

  create(body: QuoteCreate): Observable<QuoteView> {
    return this.http.post<QuoteView>('/api/quotes', body);
  }

  update(id: string, body: QuoteUpdate): Observable<QuoteView> {
    return this.http.put<QuoteView>(`/api/quotes/${id}`, body);
  }

  revise(id: string, revision: number): Observable<QuoteView> {
    return this.http.post<QuoteView>(`/api/quotes/${id}/revise`, { revision });
  }

  send(id: string, body: QuoteSend): Observable<QuoteView> {
    return this.http.post<QuoteView>(`/api/quotes/${id}/send`, body);
  }

  /** The homeowner approves on the technician's device. */
  approve(id: string, body: QuoteApprove): Observable<QuoteView> {
    return this.http.post<QuoteView>(`/api/quotes/${id}/approve`, body);
  }

  decline(id: string, body: QuoteDecline): Observable<QuoteView> {
    return this.http.post<QuoteView>(`/api/quotes/${id}/decline`, body);
  }

  savings(customerId: string): Observable<PlanSavings> {
    return this.http.get<PlanSavings>(`/api/quotes/savings/${customerId}`);
  }

  previewInvoice(body: DirectInvoice): Observable<QuoteOptionView> {
    return this.http.post<QuoteOptionView>('/api/work-invoices/preview', body);
  }

  invoice(body: DirectInvoice): Observable<InvoiceView> {
    return this.http.post<InvoiceView>('/api/work-invoices', body);
  }
}
