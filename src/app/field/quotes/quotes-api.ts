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
import type { PartsToLoad, PartsUsed, PlanSavings, QuotePage, QuotePreview, VisitInvoice } from '../../../../shared/schemas/quotes';

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

  /** The invoices issued for work on a visit. */
  visitInvoices(visitId: string): Observable<VisitInvoice[]> {
    return this.http.get<VisitInvoice[]>('/api/work-invoices', { params: params({ visitId }) });
  }

  /** The processor's payment page for one of them, opened on this device; it returns to the visit. */
  payOnDevice(invoiceId: string, visitId: string): Observable<{ checkoutUrl: string }> {
    return this.http.post<{ checkoutUrl: string }>(`/api/work-invoices/${invoiceId}/checkout`, { visitId });
  }

  /** Back from the payment page: the server reads what happened there from the processor. */
  checkoutReturn(sessionId: string): Observable<{ state: string; invoiceId: string | null }> {
    return this.http.post<{ state: string; invoiceId: string | null }>('/api/invoices/checkout-return', { sessionId });
  }

  /** Parts today's approved repairs need beyond this technician's truck. */
  partsToLoad(): Observable<PartsToLoad> {
    return this.http.get<PartsToLoad>('/api/stock/parts-to-load');
  }
}
