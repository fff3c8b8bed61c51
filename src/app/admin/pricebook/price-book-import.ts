import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { firstValueFrom, type Observable } from 'rxjs';
import { PRICE_BOOK_IMPORT_FIELDS } from '../../../../shared/pricebook';
import type { ImportMapping, ImportPreview, PriceBookImportCheck } from '../../../../shared/schemas/pricebook';
import { toApiError } from '../../core/api-errors';
import { PriceBookApi } from './price-book-api';

type Step = 'pick' | 'map' | 'done';

/** Price-book CSV import, as the household import works: pick, match the columns, see every problem by row, import all or nothing. */
@Component({
  selector: 'sw-price-book-import',
  imports: [FormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatSelectModule, MatTableModule],
  templateUrl: './price-book-import.html',
  styles: `
    :host {
      display: block;
      padding: 16px;
    }
    .mapping {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(220px, 1fr));
      gap: 0 12px;
    }
    .table-wrap {
      overflow-x: auto;
    }
    .sample {
      border-collapse: collapse;
    }
    .sample th,
    .sample td {
      border: 1px solid var(--sw-teal-soft);
      padding: 4px 6px;
      white-space: nowrap;
    }
    .buttons {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
      margin: 12px 0;
    }
    .ok {
      color: var(--sw-ok);
      font-weight: 700;
      display: flex;
      gap: 6px;
      align-items: center;
    }
    .error {
      color: var(--sw-alert);
      font-weight: 700;
      display: flex;
      gap: 6px;
      align-items: center;
    }
    .pick {
      display: grid;
      gap: 6px;
      font-weight: 700;
      margin: 12px 0;
    }
    h2 {
      font-size: 1.15rem;
      font-weight: 800;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PriceBookImport {
  private readonly api = inject(PriceBookApi);
  protected readonly fields = PRICE_BOOK_IMPORT_FIELDS;
  protected readonly step = signal<Step>('pick');
  protected readonly file = signal<File | null>(null);
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly mapping = signal<ImportMapping>({});
  protected readonly check = signal<PriceBookImportCheck | null>(null);
  protected readonly result = signal<PriceBookImportCheck | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly problemColumns = ['row', 'column', 'message'];
  protected readonly missingRequired = computed(() => PRICE_BOOK_IMPORT_FIELDS.filter((f) => f.required && !this.mapping()[f.key]).map((f) => f.label));

  private form(withMapping: boolean): FormData {
    const fd = new FormData();
    const f = this.file();
    if (f) fd.append('file', f, f.name);
    if (withMapping) fd.append('mapping', JSON.stringify(this.mapping()));
    return fd;
  }

  protected async picked(input: HTMLInputElement): Promise<void> {
    const f = input.files?.[0] ?? null;
    input.value = '';
    if (!f) return;
    this.file.set(f);
    this.check.set(null);
    this.result.set(null);
    await this.run(this.api.importPreview(this.form(false)), (p) => {
      this.preview.set(p);
      this.mapping.set(p.mapping);
      this.step.set('map');
    });
  }

  protected setMapping(key: string, column: string | null): void {
    this.mapping.set({ ...this.mapping(), [key]: column });
    this.check.set(null);
  }

  protected runCheck(): Promise<void> {
    return this.run(this.api.importCheck(this.form(true)), (c) => this.check.set(c));
  }

  protected runImport(): Promise<void> {
    return this.run(this.api.importRun(this.form(true)), (r) => {
      this.result.set(r);
      this.step.set('done');
    });
  }

  private async run<T>(call: Observable<T>, then: (v: T) => void): Promise<void> {
    this.busy.set(true);
    this.error.set(null);
    try {
      then(await firstValueFrom(call));
    } catch (err) {
      this.error.set(toApiError(err).message);
    } finally {
      this.busy.set(false);
    }
  }

  protected restart(): void {
    this.step.set('pick');
    this.file.set(null);
    this.preview.set(null);
    this.check.set(null);
    this.result.set(null);
  }
}
