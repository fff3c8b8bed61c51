import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { InvoiceView } from '../../../../shared/schemas/billing';
import type { AgreementView, RenewalBoard, RenewalView } from '../../../../shared/schemas/plans';

@Injectable({ providedIn: 'root' })
export class RenewalsApi {
  private readonly http = inject(HttpClient);
  board(view: RenewalView) {
    return this.http.get<RenewalBoard>('/api/renewals', { params: { view } });
  }
  csvUrl(view: RenewalView) {
    return `/api/renewals/export.csv?view=${view}`;
  }
  sendNotices(agreementIds: string[]) {
    return this.http.post<{ queued: number }>('/api/renewals/notices', { agreementIds });
  }
  manualRenewal(id: string, method: 'check' | 'cash', reference: string) {
    return this.http.post<{ invoice: InvoiceView; agreement: AgreementView }>(`/api/agreements/${id}/manual-renewal`, { method, reference });
  }
}
