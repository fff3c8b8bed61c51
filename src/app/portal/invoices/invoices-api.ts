import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { InvoiceSummary, InvoiceView } from '../../../../shared/schemas/billing';

@Injectable({ providedIn: 'root' })
export class InvoicesApi {
  private readonly http = inject(HttpClient);
  list() {
    return this.http.get<{ total: number; rows: InvoiceSummary[] }>('/api/invoices', { params: { limit: 100 } });
  }
  get(id: string) {
    return this.http.get<InvoiceView>(`/api/invoices/${id}`);
  }
  pay(id: string) {
    return this.http.post<{ checkoutUrl: string }>(`/api/invoices/${id}/checkout`, { returnPath: `/portal/invoices/${id}` });
  }
  checkoutReturn(sessionId: string) {
    return this.http.post<{ state: string; invoiceId: string | null }>('/api/invoices/checkout-return', { sessionId });
  }
}
