import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type {
  FlatRateTask,
  FlatRateTaskInput,
  ImportPreview,
  PriceBookImportCheck,
  PriceBookItem,
  PriceBookItemInput,
  PriceBookItemUpdate,
  PriceBookPage,
} from '../../../../shared/schemas/pricebook';

/** The owner's price book: items, flat-rate tasks, and the CSV import and export. */
@Injectable({ providedIn: 'root' })
export class PriceBookApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/price-book';
  readonly exportUrl = `${this.base}/export.csv`;

  items(q: Record<string, string | number | undefined>): Observable<PriceBookPage> {
    const fromObject = Object.fromEntries(
      Object.entries(q)
        .filter(([, v]) => v !== undefined && v !== '')
        .map(([k, v]) => [k, String(v)]),
    );
    return this.http.get<PriceBookPage>(`${this.base}/items`, { params: new HttpParams({ fromObject }) });
  }
  create(body: PriceBookItemInput): Observable<PriceBookItem> {
    return this.http.post<PriceBookItem>(`${this.base}/items`, body);
  }
  update(id: string, body: PriceBookItemUpdate): Observable<PriceBookItem> {
    return this.http.patch<PriceBookItem>(`${this.base}/items/${id}`, body);
  }
  tasks(): Observable<FlatRateTask[]> {
    return this.http.get<FlatRateTask[]>(`${this.base}/tasks`, { params: { status: 'all' } });
  }
  createTask(body: FlatRateTaskInput): Observable<FlatRateTask> {
    return this.http.post<FlatRateTask>(`${this.base}/tasks`, body);
  }
  importPreview(form: FormData): Observable<ImportPreview> {
    return this.http.post<ImportPreview>(`${this.base}/import/preview`, form);
  }
  importCheck(form: FormData): Observable<PriceBookImportCheck> {
    return this.http.post<PriceBookImportCheck>(`${this.base}/import/check`, form);
  }
  importRun(form: FormData): Observable<PriceBookImportCheck> {
    return this.http.post<PriceBookImportCheck>(`${this.base}/import/run`, form);
  }
}
