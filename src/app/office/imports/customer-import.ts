import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { IMPORT_FIELDS } from '../../../../shared/customer-fields';
import type { ImportCheck, ImportCounts, ImportMapping, ImportPreview } from '../../../../shared/schemas/customers';
import { toApiError } from '../../core/api-errors';

type Step = 'pick' | 'map' | 'done';

/** CSV import: pick a file, map its columns, see every problem by row and column, then import all or nothing. */
@Component({
  selector: 'sw-customer-import',
  imports: [FormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatSelectModule, MatTableModule],
  templateUrl: './customer-import.html',
  styleUrl: './customer-import.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CustomerImport {
  private readonly http = inject(HttpClient);
  protected readonly fields = IMPORT_FIELDS;
  protected readonly step = signal<Step>('pick');
  protected readonly file = signal<File | null>(null);
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly mapping = signal<ImportMapping>({});
  protected readonly check = signal<ImportCheck | null>(null);
  protected readonly result = signal<{ rowCount: number; counts: ImportCounts } | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly problemColumns = ['row', 'column', 'message'];
  protected readonly missingRequired = computed(() => IMPORT_FIELDS.filter((f) => f.required && !this.mapping()[f.key]).map((f) => f.label));

  private form(extra: Record<string, string> = {}): FormData {
    const fd = new FormData();
    const f = this.file();
    if (f) fd.append('file', f, f.name);
    for (const [k, v] of Object.entries(extra)) fd.append(k, v);
    return fd;
  }

  protected async picked(input: HTMLInputElement): Promise<void> {
    const f = input.files?.[0] ?? null;
    input.value = '';
    if (!f) return;
    this.file.set(f);
    this.check.set(null);
    this.result.set(null);
    await this.run(async () => {
      const p = await firstValueFrom(this.http.post<ImportPreview>('/api/imports/preview', this.form()));
      this.preview.set(p);
      this.mapping.set(p.mapping);
      this.step.set('map');
    });
  }

  protected setMapping(key: string, column: string | null): void {
    this.mapping.set({ ...this.mapping(), [key]: column });
    this.check.set(null);
  }

  protected async runCheck(): Promise<void> {
    await this.run(async () => {
      this.check.set(await firstValueFrom(this.http.post<ImportCheck>('/api/imports/check', this.form({ mapping: JSON.stringify(this.mapping()) }))));
    });
  }

  protected async runImport(): Promise<void> {
    await this.run(async () => {
      this.result.set(await firstValueFrom(this.http.post<{ rowCount: number; counts: ImportCounts }>('/api/imports/run', this.form({ mapping: JSON.stringify(this.mapping()) }))));
      this.step.set('done');
    });
  }

  private async run(fn: () => Promise<void>): Promise<void> {
    this.busy.set(true);
    this.error.set(null);
    try {
      await fn();
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
