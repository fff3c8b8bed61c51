import { ChangeDetectionStrategy, Component, inject, input, output } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import type { StoredFile } from '../../../../shared/schemas/customers';
import type { FieldVisit } from '../../../../shared/schemas/field';
import { FieldApi } from '../field-api';
import { VisitDrafts } from '../visit-drafts';
import { VisitSaves } from './visit-save';
import { photoLinkName } from '../../ui/photo-link';

/** Photos of problems found and of nameplates, taken on the phone and filed against the visit. */
@Component({
  selector: 'sw-visit-photos',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './visit-photos.html',
  styleUrl: './visit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitPhotos {
  protected readonly photoLinkName = photoLinkName;
  private readonly api = inject(FieldApi);

  readonly visitId = input.required<string>();
  readonly photos = input.required<FieldVisit['photos']>();
  readonly locked = input(false);
  /** The images just stored, for the page to show beside the others. */
  readonly added = output<StoredFile[]>();

  protected readonly saves = new VisitSaves(inject(VisitDrafts));
  protected readonly category = new FormControl<'problem' | 'nameplate'>('problem', { nonNullable: true });
  protected readonly caption = new FormControl('', { nonNullable: true, validators: [Validators.maxLength(200)] });

  protected async addPhotos(picker: HTMLInputElement): Promise<void> {
    const chosen = [...(picker.files ?? [])];
    if (!chosen.length) return;
    const id = this.visitId();
    const ok = await this.saves.run(
      id,
      'photos',
      async () => {
        const stored = await firstValueFrom(this.api.uploadPhotos(id, chosen, this.category.value, this.caption.value.trim()));
        this.added.emit(stored.filter((s) => s.contentType.startsWith('image/')));
      },
      `${chosen.length} photo${chosen.length === 1 ? '' : 's'} added.`,
    );
    if (ok) {
      picker.value = '';
      this.caption.setValue('');
    }
  }
}
