import { CurrencyPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { CustomerDetail, TimelineKind } from '../../../../shared/schemas/customers';
import type { Equipment } from '../../../../shared/schemas/equipment';
import { toApiError } from '../../core/api-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { LIFE_ICON, WARRANTY_ICON } from '../../ui/status/equipment-icons';
import { FileUpload } from '../../ui/upload/file-upload';
import { HouseholdReminders } from './household-reminders';
import { CustomersApi } from './customers-api';
import { EquipmentForm } from './equipment-form';
import { applyServerErrors, serverError } from '../../core/form-errors';
import { firstValueFrom } from 'rxjs';
import { OfficeQuotesApi } from '../quotes/office-quotes-api';
import { DayPipe } from '../../ui/dates';
import { PhoneLink } from '../../ui/phone-link';
import { pageTitle } from '../../ui/page-title';
import { photoLinkName } from '../../ui/photo-link';

const TIMELINE_ICON: Record<TimelineKind, string> = {
  created: 'add',
  property: 'home',
  equipment: 'wrench',
  agreement: 'shield',
  visit: 'calendar',
  invoice: 'receipt',
  note: 'info',
  file: 'upload',
  contact: 'person',
  merged: 'people',
  archived: 'info',
};

/** One household: its people, homes, equipment, agreements, visits, invoices, notes and files. */
@Component({
  selector: 'sw-customer-page',
  imports: [
    PhoneLink,
    CurrencyPipe,
    DayPipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    EquipmentForm,
    FileUpload,
    HouseholdReminders,
  ],
  templateUrl: './customer-page.html',
  styleUrl: './customer-page.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CustomerPage {
  protected readonly photoLinkName = photoLinkName;
  private readonly api = inject(CustomersApi);
  private readonly snack = inject(MatSnackBar);
  readonly id = input.required<string>();

  private readonly customer = rxResource({ params: () => this.id(), stream: ({ params }) => this.api.get(params) });
  protected readonly c = localCopy<CustomerDetail>(this.customer);
  protected readonly titled = pageTitle(() => this.c()?.name);
  protected readonly error = errorMessage(this.customer);
  private readonly quotesApi = inject(OfficeQuotesApi);
  private readonly savingsRead = rxResource({ params: () => this.id(), stream: ({ params }) => this.quotesApi.savings(params) });
  /** "Your plan saved you $X this year", from the coverage actually given. */
  protected readonly savings = computed(() => (this.savingsRead.hasValue() ? this.savingsRead.value() : null));
  protected readonly editing = signal(false);
  protected readonly addingEquipmentTo = signal<string | null>(null);
  protected readonly merging = signal(false);
  protected readonly busy = signal(false);
  protected readonly timelineIcon = TIMELINE_ICON;
  protected readonly lifeIcon = LIFE_ICON;
  protected readonly warrantyIcon = WARRANTY_ICON;
  protected readonly serverError = serverError;
  protected readonly photos = computed(() => (this.c()?.files ?? []).filter((f) => f.contentType.startsWith('image/')));
  protected readonly documents = computed(() => (this.c()?.files ?? []).filter((f) => f.contentType === 'application/pdf'));

  protected readonly edit = new FormGroup({
    name: new FormControl('', { nonNullable: true }),
    email: new FormControl('', { nonNullable: true }),
    phone: new FormControl('', { nonNullable: true }),
    notes: new FormControl('', { nonNullable: true }),
  });
  protected readonly note = new FormGroup({
    body: new FormControl('', { nonNullable: true }),
    audience: new FormControl<'office' | 'technician'>('office', { nonNullable: true }),
  });
  protected readonly mergeForm = new FormGroup({ sourceId: new FormControl('', { nonNullable: true }) });

  /** Reads the household again after a change that touches several of its parts. */
  protected load(): void {
    this.customer.reload();
  }

  protected startEdit(): void {
    const c = this.c();
    if (!c) return;
    this.edit.setValue({ name: c.name, email: c.email ?? '', phone: c.phone ?? '', notes: c.notes });
    this.editing.set(true);
  }

  protected async saveEdit(): Promise<void> {
    this.busy.set(true);
    try {
      this.c.set(await firstValueFrom(this.api.update(this.id(), this.edit.getRawValue())));
      this.editing.set(false);
      this.snack.open('Household saved.', 'OK', { duration: 3000 });
    } catch (err) {
      const rest = applyServerErrors(this.edit, err);
      if (rest) this.snack.open(rest, 'OK', { duration: 5000 });
    } finally {
      this.busy.set(false);
    }
  }

  protected async toggleArchive(): Promise<void> {
    const c = this.c();
    if (!c) return;
    try {
      await firstValueFrom(this.api.archive(c.id, !c.archived));
      this.snack.open(c.archived ? 'Household restored.' : 'Household archived. Its history is kept.', 'OK', { duration: 4000 });
      this.load();
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 5000 });
    }
  }

  protected async merge(): Promise<void> {
    const sourceId = this.mergeForm.controls.sourceId.value.trim().split('/').pop() ?? '';
    this.busy.set(true);
    try {
      await firstValueFrom(this.api.merge(this.id(), sourceId));
      this.merging.set(false);
      this.mergeForm.reset();
      this.snack.open('Records merged into this household.', 'OK', { duration: 4000 });
      this.load();
    } catch (err) {
      const rest = applyServerErrors(this.mergeForm, err);
      if (rest) this.snack.open(rest, 'OK', { duration: 5000 });
    } finally {
      this.busy.set(false);
    }
  }

  protected async addNote(): Promise<void> {
    try {
      await firstValueFrom(this.api.addNote(this.id(), this.note.getRawValue()));
      this.note.reset();
      this.load();
    } catch (err) {
      const rest = applyServerErrors(this.note, err);
      if (rest) this.snack.open(rest, 'OK', { duration: 5000 });
    }
  }

  protected async equipmentSaved(): Promise<void> {
    this.addingEquipmentTo.set(null);
    this.snack.open('Equipment saved.', 'OK', { duration: 3000 });
    this.load();
  }

  protected async archiveEquipment(e: Equipment): Promise<void> {
    await firstValueFrom(this.api.archiveEquipment(e.id));
    this.snack.open(`${e.kindLabel} archived.`, 'OK', { duration: 3000 });
    this.load();
  }
}
