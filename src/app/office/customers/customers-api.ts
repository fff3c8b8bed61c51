import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable } from 'rxjs';
import type {
  Contact,
  ContactInput,
  CustomerCreate,
  CustomerDetail,
  CustomerListQuery,
  CustomerPage,
  CustomerUpdate,
  Note,
  Property,
  PropertyInput,
} from '../../../../shared/schemas/customers';
import type { Equipment } from '../../../../shared/schemas/equipment';

export type ListQuery = Partial<Pick<CustomerListQuery, 'q' | 'sort' | 'dir' | 'page' | 'pageSize' | 'status'>>;

/** Households, properties and equipment for the office. */
@Injectable({ providedIn: 'root' })
export class CustomersApi {
  private readonly http = inject(HttpClient);

  private params(q: ListQuery): HttpParams {
    let p = new HttpParams();
    for (const [k, v] of Object.entries(q)) if (v !== undefined && v !== null && v !== '') p = p.set(k, String(v));
    return p;
  }

  list(q: ListQuery): Observable<CustomerPage> {
    return this.http.get<CustomerPage>('/api/customers', { params: this.params(q) });
  }

  exportUrl(q: ListQuery): string {
    const { page: _p, pageSize: _s, ...rest } = q;
    const qs = this.params(rest).toString();
    return `/api/customers/export.csv${qs ? `?${qs}` : ''}`;
  }

  get(id: string): Observable<CustomerDetail> {
    return this.http.get<CustomerDetail>(`/api/customers/${id}`);
  }

  create(body: CustomerCreate | Record<string, unknown>): Observable<{ id: string; propertyId: string | null }> {
    return this.http.post<{ id: string; propertyId: string | null }>('/api/customers', body);
  }

  update(id: string, body: CustomerUpdate | Record<string, unknown>): Observable<CustomerDetail> {
    return this.http.patch<CustomerDetail>(`/api/customers/${id}`, body);
  }

  archive(id: string, archived: boolean): Observable<unknown> {
    return this.http.post(`/api/customers/${id}/${archived ? 'archive' : 'restore'}`, {});
  }

  merge(targetId: string, sourceId: string): Observable<unknown> {
    return this.http.post(`/api/customers/${targetId}/merge`, { sourceId });
  }

  addContact(id: string, body: ContactInput | Record<string, unknown>): Observable<Contact> {
    return this.http.post<Contact>(`/api/customers/${id}/contacts`, body);
  }

  addNote(id: string, body: { body: string; audience: 'office' | 'technician'; propertyId?: string | null }): Observable<Note> {
    return this.http.post<Note>(`/api/customers/${id}/notes`, body);
  }

  addProperty(id: string, body: PropertyInput | Record<string, unknown>): Observable<Property> {
    return this.http.post<Property>(`/api/customers/${id}/properties`, body);
  }

  addEquipment(body: Record<string, unknown>): Observable<Equipment> {
    return this.http.post<Equipment>('/api/equipment', body);
  }

  archiveEquipment(id: string): Observable<unknown> {
    return this.http.post(`/api/equipment/${id}/archive`, {});
  }
}
