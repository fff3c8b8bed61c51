import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { MatTab, MatTabGroup } from '@angular/material/tabs';
import { DomSanitizer } from '@angular/platform-browser';
import { ActivatedRoute, Router } from '@angular/router';
import { Subscription, debounceTime, of, switchMap, takeWhile, timer } from 'rxjs';
import { EQUIPMENT_KINDS, EQUIPMENT_KIND_LABELS } from '../../../../shared/equipment';
import { REMINDER_KINDS, REMINDER_LABELS, type ReminderKind } from '../../../../shared/reminder-labels';
import type { AudienceFilter, MessagePreview, ReminderCampaignSummary, ReminderPreview } from '../../../../shared/schemas/campaigns';
import { CAMPAIGN_SCHEDULE_MONTHS } from '../../../../shared/horizons';
import { toApiError } from '../../core/api-errors';
import { Session } from '../../core/session';
import { errorMessage, localCopy } from '../../core/resource-state';
import { CampaignRecipients } from './campaign-recipients';
import { RemindersApi } from './reminders-api';
import { DateTimePipe, dateTimeInputValue } from '../../ui/dates';

const KIND_TEXT: Record<ReminderKind, { icon: string; text: string }> = {
  cooling_tune_up: { icon: 'snowflake', text: 'Plan members whose spring cooling tune-up is not booked yet.' },
  heating_tune_up: { icon: 'flame', text: 'Plan members whose fall heating tune-up is not booked yet.' },
  filter: { icon: 'wrench', text: 'Filters due by their type, the household and the last change.' },
  coil_cleaning: { icon: 'gauge', text: 'Outdoor coils a year after the last tune-up, or sooner when a technician advised it.' },
  condensate_drain: { icon: 'gauge', text: 'Condensate drains once a year, or sooner when a technician advised it.' },
};

/** Campaigns: pick a kind and an audience, see the count and three messages, send or schedule, watch it go. */
@Component({
  selector: 'sw-reminders',
  imports: [
    CampaignRecipients,
    DateTimePipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatCardModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
    MatTab,
    MatTabGroup,
  ],
  templateUrl: './reminders.html',
  styleUrl: './reminders.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Reminders {
  private readonly api = inject(RemindersApi);
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly destroyRef = inject(DestroyRef);
  private readonly sanitizer = inject(DomSanitizer);
  private readonly session = inject(Session);
  private polling: Subscription | null = null;

  protected readonly kinds = REMINDER_KINDS.map((kind) => ({ kind, label: REMINDER_LABELS[kind], ...KIND_TEXT[kind] }));
  protected readonly equipmentKinds = EQUIPMENT_KINDS.map((k) => ({ value: k, label: EQUIPMENT_KIND_LABELS[k] }));
  protected readonly columns = ['name', 'email', 'reason'];
  protected readonly filters = new FormGroup({
    plan: new FormControl('', { nonNullable: true }),
    area: new FormControl('', { nonNullable: true }),
    equipmentKind: new FormControl('', { nonNullable: true }),
    noTuneUpThisSeason: new FormControl(false, { nonNullable: true }),
  });
  protected readonly sendAt = new FormControl('', { nonNullable: true });
  protected readonly selected = signal<ReminderKind | null>(null);
  private readonly filter = signal<AudienceFilter>({});
  private readonly plansRead = rxResource({ stream: () => this.api.plans() });
  protected readonly plans = computed(() => (this.plansRead.hasValue() ? this.plansRead.value().plans : []));
  private readonly previewRead = rxResource({
    params: () => (this.selected() ? { kind: this.selected()!, filter: this.filter() } : undefined),
    stream: ({ params }) => this.api.preview(params.kind, params.filter),
  });
  private readonly messagesRead = rxResource({
    params: () => (this.selected() && this.showMessages() ? { kind: this.selected()!, filter: this.filter() } : undefined),
    stream: ({ params }) => (params ? this.api.messages(params.kind, params.filter) : of({ messages: [] })),
  });
  private readonly historyRead = rxResource({ stream: () => this.api.campaigns() });
  protected readonly preview = localCopy<ReminderPreview>(this.previewRead, true);
  protected readonly loading = this.previewRead.isLoading;
  protected readonly showMessages = signal(false);
  // Our own rendered e-mails, shown in sandboxed frames (no scripts, no same origin).
  protected readonly messages = computed(() =>
    (this.messagesRead.hasValue() ? this.messagesRead.value().messages : []).map((m: MessagePreview) => ({ ...m, safeHtml: this.sanitizer.bypassSecurityTrustHtml(m.html) })),
  );
  protected readonly confirming = signal(false);
  protected readonly sending = signal(false);
  private readonly previewError = errorMessage(this.previewRead);
  private readonly sendError = signal<string | null>(null);
  protected readonly sendAtError = signal<string | null>(null);
  // The field offers what the server takes: from now to CAMPAIGN_SCHEDULE_MONTHS ahead, in the company's zone.
  protected readonly sendAtBounds = computed(() => {
    if (!this.confirming()) return { min: '', max: '' };
    const now = new Date();
    const zone = this.session.timeZone();
    return { min: dateTimeInputValue(now, zone), max: dateTimeInputValue(now, zone, { months: CAMPAIGN_SCHEDULE_MONTHS }) };
  });
  protected readonly error = computed(() => this.sendError() ?? this.previewError());
  protected readonly campaign = signal<ReminderCampaignSummary | null>(null);
  protected readonly history = computed<ReminderCampaignSummary[]>(() => (this.historyRead.hasValue() ? this.historyRead.value().campaigns : []));
  protected readonly audienceCount = computed(() => this.preview()?.count ?? 0);
  protected readonly progressPct = computed(() => {
    const c = this.campaign();
    return c && c.audienceCount ? Math.min(100, Math.round(((c.sent + c.failed + c.suppressed) / c.audienceCount) * 100)) : 0;
  });

  constructor() {
    // The chosen kind lives in the URL, so a link shares the exact view.
    this.route.queryParamMap.pipe(takeUntilDestroyed()).subscribe((params) => {
      const kind = params.get('kind') as ReminderKind | null;
      if (kind && REMINDER_KINDS.includes(kind)) this.load(kind);
    });
    this.filters.valueChanges.pipe(debounceTime(300), takeUntilDestroyed()).subscribe((v) => {
      const f: AudienceFilter = {};
      if (v.plan) f.plan = v.plan;
      if (v.area?.trim()) f.area = v.area.trim();
      if (v.equipmentKind) f.equipmentKind = v.equipmentKind as AudienceFilter['equipmentKind'];
      if (v.noTuneUpThisSeason) f.noTuneUpThisSeason = true;
      this.confirming.set(false);
      this.filter.set(f);
    });
  }

  protected choose(kind: ReminderKind): void {
    void this.router.navigate([], { queryParams: { kind }, queryParamsHandling: 'merge' });
  }

  private load(kind: ReminderKind): void {
    this.confirming.set(false);
    this.sendError.set(null);
    if (kind === this.selected()) this.previewRead.reload();
    else this.selected.set(kind);
  }

  protected send(): void {
    const p = this.preview();
    if (!p || this.sending()) return;
    this.sending.set(true);
    this.sendError.set(null);
    this.sendAtError.set(null);
    this.api.send(p.kind, this.filter(), p.count, this.sendAt.value || undefined).subscribe({
      next: (c) => {
        this.sending.set(false);
        this.confirming.set(false);
        this.campaign.set(c);
        this.watch(c.id);
      },
      error: (err: unknown) => {
        this.sending.set(false);
        const e = toApiError(err);
        if (e.fields?.['sendAt']) this.sendAtError.set(e.fields['sendAt']);
        this.sendError.set(e.message);
        // The audience moved under us: show the new count before anyone sends again.
        if (e.code === 'audience_changed') this.load(p.kind);
      },
    });
  }

  protected act(action: 'pause' | 'resume' | 'cancel'): void {
    const c = this.campaign();
    if (!c) return;
    this.api.act(c.id, action).subscribe({
      next: (next) => {
        this.campaign.set(next);
        if (next.status === 'sending' || next.status === 'scheduled') this.watch(next.id);
      },
      error: (err: unknown) => this.sendError.set(toApiError(err).message),
    });
  }

  protected watchCampaign(c: ReminderCampaignSummary): void {
    this.campaign.set(c);
    this.watch(c.id);
  }

  private watch(id: string): void {
    this.polling?.unsubscribe();
    this.polling = timer(0, 1000)
      .pipe(
        switchMap(() => this.api.campaign(id)),
        takeWhile((c) => c.status === 'sending' || c.status === 'scheduled', true),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (c) => this.campaign.set(c),
        complete: () => {
          this.historyRead.reload();
          const kind = this.selected();
          if (kind) this.load(kind);
        },
      });
  }
}
