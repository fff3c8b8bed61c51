import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { PlanTerms, PlanView } from '../../../../shared/schemas/plans';

@Injectable({ providedIn: 'root' })
export class PlanAdminApi {
  private readonly http = inject(HttpClient);
  list() {
    return this.http.get<{ plans: PlanView[] }>('/api/plans', { params: { all: '1' } });
  }
  create(body: PlanTerms & { code: string }) {
    return this.http.post<PlanView>('/api/plans', body);
  }
  update(id: string, body: PlanTerms) {
    return this.http.put<PlanView>(`/api/plans/${id}`, body);
  }
  setActive(id: string, active: boolean) {
    return this.http.patch<PlanView>(`/api/plans/${id}`, { active });
  }
}
