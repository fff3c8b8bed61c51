import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterLink } from '@angular/router';
import { PRICE_BOOK_IMPORT_FIELDS } from '../../../../shared/pricebook';
import type { PriceBookImportCheck } from '../../../../shared/schemas/pricebook';
import { CsvImport, type CsvImportApi } from '../../ui/csv-import/csv-import';
import { PriceBookApi } from './price-book-api';

/** Price-book CSV import, as the household import works: pick, match the columns, see every problem by row, import all or nothing. */
@Component({
  selector: 'sw-price-book-import',
  imports: [RouterLink, CsvImport],
  templateUrl: './price-book-import.html',
  host: { class: 'sw-page' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PriceBookImport {
  private readonly priceBook = inject(PriceBookApi);
  protected readonly fields = PRICE_BOOK_IMPORT_FIELDS;
  protected readonly api: CsvImportApi<PriceBookImportCheck, PriceBookImportCheck> = {
    preview: (form) => this.priceBook.importPreview(form),
    check: (form) => this.priceBook.importCheck(form),
    run: (form) => this.priceBook.importRun(form),
  };
}
