import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { AgreementView, PlanView } from '../../../../shared/schemas/plans';

export interface HomeChoice {
  id: string;
  label: string;
  address: string;
  covered: boolean;
}

export interface CheckoutReturn {
  state: 'paid' | 'open' | 'expired' | 'saved' | 'unknown';
  invoiceId: string | null;
}

/** Plans, the household's agreements, and the payment pages that renew or enroll them. */
@Injectable({ providedIn: 'root' })
export class PlansApi {
  private readonly http = inject(HttpClient);

  plans(all = false) {
    return this.http.get<{ plans: PlanView[] }>('/api/plans', { params: all ? { all: '1' } : {} });
  }
  mine() {
    return this.http.get<{ agreements: AgreementView[]; properties: HomeChoice[] }>('/api/agreements/mine');
  }
  enroll(body: { propertyId: string; planId: string; systemsCount: number; autoRenew: boolean }) {
    return this.http.post<{ agreementId: string; invoiceId: string; checkoutUrl: string }>('/api/agreements/enroll', body);
  }
  renew(id: string, autoRenew: boolean) {
    return this.http.post<{ invoiceId: string; checkoutUrl: string }>(`/api/agreements/${id}/renew`, { autoRenew });
  }
  setAutoRenew(id: string, enabled: boolean) {
    return this.http.post<{ agreement: AgreementView; checkoutUrl?: string }>(`/api/agreements/${id}/auto-renew`, { enabled });
  }
  updateCard(id: string) {
    return this.http.post<{ checkoutUrl: string }>(`/api/agreements/${id}/card`, {});
  }
  checkoutReturn(sessionId: string) {
    return this.http.post<CheckoutReturn>('/api/invoices/checkout-return', { sessionId });
  }
}
