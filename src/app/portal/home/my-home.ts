import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { MyHome as MyHomeData, Property } from '../../../../shared/schemas/customers';
import { applyServerErrors, serverError } from '../../core/form-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { LIFE_ICON, WARRANTY_ICON } from '../../ui/status/equipment-icons';
import { FileUpload } from '../../ui/upload/file-upload';
import { ReadingsChart } from '../readings-chart/readings-chart';
import { MyHomeApi } from './my-home-api';
import { firstValueFrom } from 'rxjs';
import { DayPipe } from '../../ui/dates';
import { PhoneLink } from '../../ui/phone-link';
import { photoLinkName } from '../../ui/photo-link';

/** "My home": the homeowner's homes, equipment, service history, readings, photos and documents. */
@Component({
  selector: 'sw-my-home',
  imports: [PhoneLink, DayPipe, ReactiveFormsModule, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatInputModule, FileUpload, ReadingsChart],
  templateUrl: './my-home.html',
  styleUrl: './my-home.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyHome {
  protected readonly photoLinkName = photoLinkName;
  private readonly api = inject(MyHomeApi);
  private readonly snack = inject(MatSnackBar);
  private readonly read = rxResource({ stream: () => this.api.load() });
  protected readonly home = localCopy<MyHomeData>(this.read);
  protected readonly error = errorMessage(this.read);
  protected readonly serverError = serverError;
  protected readonly editingContact = signal(false);
  protected readonly editingDoor = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly lifeIcon = LIFE_ICON;
  protected readonly warrantyIcon = WARRANTY_ICON;
  protected readonly photos = computed(() => (this.home()?.files ?? []).filter((f) => f.contentType.startsWith('image/')));
  protected readonly documents = computed(() => (this.home()?.files ?? []).filter((f) => f.contentType === 'application/pdf'));
  // Grouped and sorted on the server by groupServiceHistory (shared/visits.ts).
  protected readonly history = computed(() => this.home()?.past ?? []);
  protected readonly upcoming = computed(() => this.home()?.upcoming ?? []);

  protected readonly contact = new FormGroup({
    name: new FormControl('', { nonNullable: true }),
    email: new FormControl('', { nonNullable: true }),
    phone: new FormControl('', { nonNullable: true }),
  });
  protected readonly door = new FormGroup({
    accessNotes: new FormControl('', { nonNullable: true }),
    gateCode: new FormControl('', { nonNullable: true }),
    pets: new FormControl('', { nonNullable: true }),
    /** Sent as a note of its own, not as part of the access details. */
    note: new FormControl('', { nonNullable: true }),
  });
  /** What belongs to no field of the form being saved. */
  protected readonly contactError = signal<string | null>(null);
  protected readonly doorError = signal<string | null>(null);

  protected load(): void {
    this.read.reload();
  }

  protected startContact(): void {
    const h = this.home()?.household;
    if (!h) return;
    this.contact.setValue({ name: h.name, email: h.email ?? '', phone: h.phone ?? '' });
    this.contactError.set(null);
    this.editingContact.set(true);
  }

  protected async saveContact(): Promise<void> {
    this.saving.set(true);
    try {
      const household = await firstValueFrom(this.api.updateContact(this.contact.getRawValue()));
      this.home.update((h) => (h ? { ...h, household } : h));
      this.editingContact.set(false);
      this.snack.open('Contact details saved.', 'OK', { duration: 3000 });
    } catch (err) {
      this.contactError.set(applyServerErrors(this.contact, err));
    } finally {
      this.saving.set(false);
    }
  }

  protected startDoor(p: Property): void {
    this.door.setValue({ accessNotes: p.accessNotes, gateCode: p.gateCode, pets: p.pets, note: '' });
    this.doorError.set(null);
    this.editingDoor.set(p.id);
  }

  protected async saveDoor(p: Property): Promise<void> {
    this.saving.set(true);
    try {
      const { note, ...access } = this.door.getRawValue();
      await firstValueFrom(this.api.updateAccess(p.id, access));
      const text = note.trim();
      if (text) await firstValueFrom(this.api.addNote(p.id, text));
      this.editingDoor.set(null);
      this.snack.open('Saved. Your technician will see this before the visit.', 'OK', { duration: 4000 });
      this.load();
    } catch (err) {
      this.doorError.set(applyServerErrors(this.door, err, { body: 'note' }));
    } finally {
      this.saving.set(false);
    }
  }
}
