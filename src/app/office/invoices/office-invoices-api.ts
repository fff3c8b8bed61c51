import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { CreateInvoiceInput, InvoiceStatus, InvoiceSummary, InvoiceView, OfflinePaymentInput, RefundInput } from '../../../../shared/schemas/billing';

@Injectable({ providedIn: 'root' })
export class OfficeInvoicesApi {
  private readonly http = inject(HttpClient);
  list(q: { status?: InvoiceStatus | ''; q?: string; offset?: number }) {
    const params: Record<string, string> = { limit: '50', offset: String(q.offset ?? 0) };
    if (q.status) params['status'] = q.status;
    if (q.q) params['q'] = q.q;
    return this.http.get<{ total: number; rows: InvoiceSummary[] }>('/api/invoices', { params });
  }
  get(id: string) {
    return this.http.get<InvoiceView>(`/api/invoices/${id}`);
  }
  create(body: CreateInvoiceInput) {
    return this.http.post<InvoiceView>('/api/invoices', body);
  }
  recordPayment(id: string, body: OfflinePaymentInput) {
    return this.http.post<InvoiceView>(`/api/invoices/${id}/payments`, body);
  }
  refund(id: string, body: RefundInput, key: string) {
    return this.http.post<InvoiceView>(`/api/invoices/${id}/refunds`, body, { headers: { 'Idempotency-Key': key } });
  }
  void(id: string) {
    return this.http.post<InvoiceView>(`/api/invoices/${id}/void`, {});
  }
}
