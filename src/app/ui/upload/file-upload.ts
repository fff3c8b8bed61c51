import { HttpClient, HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, ElementRef, inject, input, output, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { FileCategory, StoredFile } from '../../../../shared/schemas/customers';
import { toApiError } from '../../core/api-errors';

const MAX_BYTES = 10 * 1024 * 1024;
const MAX_FILES = 10;
const ACCEPT = 'image/jpeg,image/png,image/webp,application/pdf';

/**
 * Picks photos or PDFs and uploads them with a progress bar. The browser's XHR backend reports
 * upload progress; the server still checks every file by its content.
 */
@Component({
  selector: 'sw-file-upload',
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    <div class="upload">
      <input #picker type="file" [accept]="accept" multiple [attr.aria-label]="label()" (change)="picked(picker)" class="visually-hidden" [id]="inputId" />
      <button mat-stroked-button type="button" (click)="picker.click()" [disabled]="busy()">
        <mat-icon svgIcon="upload" />
        {{ label() }}
      </button>
      <span class="hint">JPEG, PNG, WebP or PDF, up to 10 MB each, 10 at a time.</span>
      @if (busy()) {
        <mat-progress-bar mode="determinate" [value]="progress()" [attr.aria-label]="'Uploading, ' + progress() + ' percent'" />
        <span class="status" role="status">Uploading… {{ progress() }} %</span>
      }
      @if (error()) {
        <p class="error" role="alert"><mat-icon svgIcon="warning" /> {{ error() }}</p>
      }
      @if (done()) {
        <p class="status" role="status"><mat-icon svgIcon="check" /> {{ done() }}</p>
      }
    </div>
  `,
  styles: `
    .upload {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 12px;
    }
    .hint {
      font-size: 0.85rem;
      opacity: 0.8;
    }
    mat-progress-bar {
      flex-basis: 100%;
    }
    .error,
    .status {
      display: flex;
      align-items: center;
      gap: 6px;
      margin: 0;
      flex-basis: 100%;
    }
    .error {
      color: var(--mat-sys-error);
    }
    .visually-hidden {
      position: absolute;
      width: 1px;
      height: 1px;
      overflow: hidden;
      clip: rect(0 0 0 0);
      white-space: nowrap;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FileUpload {
  private readonly http = inject(HttpClient);
  private static next = 0;
  protected readonly inputId = `sw-upload-${FileUpload.next++}`;
  protected readonly accept = ACCEPT;
  private readonly picker = viewChild<ElementRef<HTMLInputElement>>('picker');

  /** Where the files belong: any of customerId, propertyId, equipmentId, visitId. */
  readonly target = input.required<Partial<Record<'customerId' | 'propertyId' | 'equipmentId' | 'visitId', string>>>();
  readonly category = input<FileCategory>('other');
  readonly label = input('Add photos or documents');
  readonly uploaded = output<StoredFile[]>();

  protected readonly busy = signal(false);
  protected readonly progress = signal(0);
  protected readonly error = signal<string | null>(null);
  protected readonly done = signal<string | null>(null);

  protected picked(el: HTMLInputElement): void {
    const files = Array.from(el.files ?? []);
    el.value = '';
    this.done.set(null);
    this.error.set(null);
    if (!files.length) return;
    if (files.length > MAX_FILES) return this.error.set(`Choose at most ${MAX_FILES} files at a time.`);
    const big = files.find((f) => f.size > MAX_BYTES);
    if (big) return this.error.set(`"${big.name}" is over 10 MB.`);
    const form = new FormData();
    for (const [k, v] of Object.entries(this.target())) if (v) form.append(k, v);
    form.append('category', this.category());
    for (const f of files) form.append('files', f, f.name);
    this.busy.set(true);
    this.progress.set(0);
    this.http.post<StoredFile[]>('/api/files', form, { reportProgress: true, observe: 'events' }).subscribe({
      next: (ev) => {
        if (ev.type === HttpEventType.UploadProgress) this.progress.set(ev.total ? Math.round((ev.loaded / ev.total) * 100) : 0);
        if (ev.type === HttpEventType.Response) {
          const body = ev.body ?? [];
          this.busy.set(false);
          this.done.set(`Uploaded ${body.length} file${body.length === 1 ? '' : 's'}.`);
          this.uploaded.emit(body);
        }
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.error.set(toApiError(err).message);
      },
    });
  }

  /** Opens the picker from outside, e.g. a "Photograph nameplate" action. */
  open(): void {
    this.picker()?.nativeElement.click();
  }
}
