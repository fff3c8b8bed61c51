import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import type { StoredFile } from '../../../../shared/schemas/customers';
import type { CompletedVisit, FieldVisit, SavedReadings } from '../../../../shared/schemas/field';
import { toApiError } from '../../core/api-errors';
import { Session } from '../../core/session';
import { FieldApi } from '../field-api';
import { QuoteBuilder } from '../quotes/quote-builder';
import { QuotesApi } from '../quotes/quotes-api';
import { VisitPayments } from '../quotes/visit-payments';
import { WorkInvoice } from '../quotes/work-invoice';
import { VisitDrafts } from '../visit-drafts';
import { CautionNote } from './caution-note';
import { CoverageBanner } from './coverage-banner';
import { ReadingsForm } from './readings-form';
import { VisitChecklist } from './visit-checklist';
import { VisitNotes } from './visit-notes';
import { VisitPhotos } from './visit-photos';
import { VisitSaves } from './visit-save';
import { VisitTroubleshooting } from './visit-troubleshooting';
import { PhoneLink } from '../../ui/phone-link';
import { DayPipe } from '../../ui/dates';

/** One visit on site: header, coverage, checklist or troubleshooting, readings, findings, completion. */
@Component({
  selector: 'sw-visit-page',
  imports: [
    DayPipe,
    PhoneLink,
    RouterLink,
    MatButtonModule,
    MatIconModule,
    CautionNote,
    CoverageBanner,
    ReadingsForm,
    VisitChecklist,
    VisitNotes,
    VisitPhotos,
    VisitTroubleshooting,
    QuoteBuilder,
    VisitPayments,
    WorkInvoice,
  ],
  templateUrl: './visit-page.html',
  styleUrl: './visit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitPage {
  private readonly api = inject(FieldApi);
  private readonly session = inject(Session);
  private readonly quotesApi = inject(QuotesApi);
  private readonly trucks = rxResource({ stream: () => this.quotesApi.locations() });
  /** The signed-in technician's truck: where quoted parts come from first. */
  protected readonly truckId = computed(() => {
    const ls = this.trucks.hasValue() ? this.trucks.value() : [];
    const me = this.session.user();
    const trucks = ls.filter((l) => l.kind === 'truck');
    // A technician is shown only their own truck; the owner sees all of them.
    const mine = trucks.find((l) => l.technicianId === me?.id || l.technicianName === me?.name) ?? (me?.role === 'technician' ? trucks[0] : undefined);
    return mine?.id ?? null;
  });

  /** Route parameter. */
  readonly id = input.required<string>();
  /** The checklist season asked for; undefined lets the server pick today's. */
  private readonly season = signal<'cooling' | 'heating' | undefined>(undefined);

  private readonly visit = rxResource({
    params: () => ({ id: this.id(), season: this.season() }),
    stream: ({ params }) => this.api.visit(params.id, params.season),
  });
  /** The last answer from the server; it stays on screen while another season loads. */
  protected readonly loaded = linkedSignal<FieldVisit | undefined, FieldVisit | null>({
    source: () => (this.visit.hasValue() ? this.visit.value() : undefined),
    computation: (v, prev) => v ?? prev?.value ?? null,
  });
  /** The loaded visit with what was done since: status moves, photos, readings. */
  protected readonly page = linkedSignal(() => this.loaded());
  /** The checklist as last saved, which the completion check lists open items from. */
  protected readonly checklistNow = linkedSignal(() => this.loaded()?.checklist ?? []);
  protected readonly loadError = computed(() => {
    const e = this.visit.error();
    return e ? toApiError(e).message : null;
  });

  protected readonly saves = new VisitSaves(inject(VisitDrafts));
  /** Counts invoices issued on this page, so the payment list reads them again. */
  protected readonly invoiced = signal(0);
  protected readonly locked = computed(() => {
    const s = this.page()?.visit.status;
    return s === 'done' || s === 'canceled' || s === 'no_show';
  });
  protected readonly caution = (id: string) => this.page()?.cautions.find((c) => c.id === id);

  protected readonly nextStep = computed(() => {
    const s = this.page()?.visit.status;
    if (s === 'scheduled') return { status: 'on_the_way' as const, label: 'On my way', done: 'On the way' };
    if (s === 'on_the_way') return { status: 'on_site' as const, label: 'Arrived on site', done: 'On site' };
    return null;
  });

  protected retry(): void {
    this.visit.reload();
  }

  protected switchSeason(season: 'cooling' | 'heating'): void {
    this.season.set(season);
  }

  private patch(change: (p: FieldVisit) => FieldVisit): void {
    const p = this.page();
    if (p) this.page.set(change(p));
  }

  protected async advance(): Promise<void> {
    const p = this.page();
    const step = this.nextStep();
    if (!p || !step) return;
    const ok = await this.saves.run(p.visit.id, 'status', () => firstValueFrom(this.api.setStatus(p.visit.id, step.status)), `Status: ${step.done}.`);
    if (ok) this.patch((v) => ({ ...v, visit: { ...v.visit, status: step.status, statusLabel: step.done } }));
  }

  protected onReadingsSaved(saved: SavedReadings): void {
    this.patch((p) => ({ ...p, readings: [...p.readings.filter((r) => r.equipmentId !== saved.equipmentId), saved] }));
  }

  protected onPhotosAdded(stored: StoredFile[]): void {
    this.patch((p) => ({ ...p, photos: [...p.photos, ...stored] }));
  }

  protected onCompleted(res: CompletedVisit): void {
    this.patch((p) => ({ ...p, visit: { ...p.visit, status: res.status, statusLabel: 'Done', completedAt: res.completedAt } }));
  }
}
