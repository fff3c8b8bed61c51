import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterLink } from '@angular/router';
import { IMPORT_FIELDS } from '../../../../shared/customer-fields';
import type { ImportCheck, ImportCounts, ImportPreview } from '../../../../shared/schemas/customers';
import { CsvImport, type CsvImportApi } from '../../ui/csv-import/csv-import';

type ImportDone = { rowCount: number; counts: ImportCounts };

/** Households from a CSV file: one row per piece of equipment, all or nothing. */
@Component({
  selector: 'sw-customer-import',
  imports: [RouterLink, CsvImport],
  templateUrl: './customer-import.html',
  host: { class: 'sw-page' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CustomerImport {
  private readonly http = inject(HttpClient);
  protected readonly fields = IMPORT_FIELDS;
  protected readonly api: CsvImportApi<ImportCheck, ImportDone> = {
    preview: (form) => this.http.post<ImportPreview>('/api/imports/preview', form),
    check: (form) => this.http.post<ImportCheck>('/api/imports/check', form),
    run: (form) => this.http.post<ImportDone>('/api/imports/run', form),
  };
}
