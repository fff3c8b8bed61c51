import { NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, signal, type TemplateRef } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { firstValueFrom, type Observable } from 'rxjs';
import type { ImportMapping, ImportPreview } from '../../../../shared/schemas/customers';
import { toApiError } from '../../core/api-errors';

type Step = 'pick' | 'map' | 'done';

/** A column the import reads, as the shared contract lists it. */
export interface CsvImportField {
  readonly key: string;
  readonly label: string;
  readonly required?: boolean;
}

/** What any import's check answers: valid or not, and each problem by row and column. */
export interface CsvImportCheck {
  valid: boolean;
  rowCount: number;
  problems: readonly { row: number; column?: string | null; message: string }[];
}

/** The three calls behind an import, each sent the file (and, after the first, the mapping). */
export interface CsvImportApi<C extends CsvImportCheck, R> {
  preview(form: FormData): Observable<ImportPreview>;
  check(form: FormData): Observable<C>;
  run(form: FormData): Observable<R>;
}

/**
 * The CSV import every list shares: pick a file, match its columns, see the first rows and every
 * problem by row and column, then import all or nothing. The page around it says what is imported
 * (projected content: the intro, and `[pickHint]` under the file picker) and what a good check and a
 * finished import add up to (the `valid` and `done` templates), and where to see the rows (`doneLink`).
 */
@Component({
  selector: 'sw-csv-import',
  imports: [FormsModule, NgTemplateOutlet, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatSelectModule, MatTableModule],
  templateUrl: './csv-import.html',
  styleUrl: './csv-import.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CsvImport<C extends CsvImportCheck, R> {
  readonly fields = input.required<readonly CsvImportField[]>();
  readonly api = input.required<CsvImportApi<C, R>>();
  /** Shown above the import button when every row is good; context `$implicit` is the check. */
  readonly valid = input.required<TemplateRef<{ $implicit: C }>>();
  /** What the import added, once it ran; context `$implicit` is its answer. */
  readonly done = input.required<TemplateRef<{ $implicit: R }>>();
  /** Where the imported rows are seen. */
  readonly doneLink = input.required<{ label: string; link: string }>();

  protected readonly step = signal<Step>('pick');
  protected readonly file = signal<File | null>(null);
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly mapping = signal<ImportMapping>({});
  protected readonly check = signal<C | null>(null);
  protected readonly result = signal<R | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly problemColumns = ['row', 'column', 'message'];
  protected readonly missingRequired = computed(() =>
    this.fields()
      .filter((f) => f.required && !this.mapping()[f.key])
      .map((f) => f.label),
  );
  /** A problem's column as the file names it; a column the file lacks, by our field's label. */
  protected columnLabel(column: string | null | undefined): string {
    if (!column) return '—';
    return this.fields().find((f) => f.key === column)?.label ?? column;
  }

  protected restart(): void {
    this.step.set('pick');
    this.file.set(null);
    this.preview.set(null);
    this.check.set(null);
    this.result.set(null);
  }

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
    await this.run(this.api().preview(this.form(false)), (p) => {
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
    return this.run(this.api().check(this.form(true)), (c) => this.check.set(c));
  }

  protected runImport(): Promise<void> {
    return this.run(this.api().run(this.form(true)), (r) => {
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
}
