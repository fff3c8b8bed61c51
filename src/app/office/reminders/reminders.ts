import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { ActivatedRoute, Router } from '@angular/router';
import { Subscription, switchMap, takeWhile, timer } from 'rxjs';
import { REMINDER_KINDS, REMINDER_LABELS, type ReminderKind } from '../../../../shared/seasonal-reminders';
import type { ReminderCampaignSummary, ReminderPreview } from '../../../../shared/schemas/campaigns';
import { toApiError } from '../../core/api-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { RemindersApi } from './reminders-api';
import { DateTimePipe } from '../../ui/dates';

const KIND_TEXT: Record<ReminderKind, { icon: string; text: string }> = {
  cooling_tune_up: { icon: 'snowflake', text: 'Plan members whose spring cooling tune-up is not booked yet.' },
  heating_tune_up: { icon: 'flame', text: 'Plan members whose fall heating tune-up is not booked yet.' },
  filter: { icon: 'wrench', text: 'Households whose filter is due for a change, by filter size and last visit.' },
  coil_cleaning: { icon: 'gauge', text: 'Outdoor coils a technician flagged, or plans that include a yearly cleaning.' },
};

/** Seasonal reminders: pick a kind, see exactly who gets it and why, send once, watch it go. */
@Component({
  selector: 'sw-reminders',
  imports: [DateTimePipe, MatButtonModule, MatCardModule, MatIconModule, MatProgressBarModule, MatTableModule],
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
  private polling: Subscription | null = null;

  protected readonly kinds = REMINDER_KINDS.map((kind) => ({ kind, label: REMINDER_LABELS[kind], ...KIND_TEXT[kind] }));
  protected readonly columns = ['name', 'email', 'reason'];
  protected readonly selected = signal<ReminderKind | null>(null);
  private readonly previewRead = rxResource({ params: () => this.selected() ?? undefined, stream: ({ params }) => this.api.preview(params) });
  private readonly historyRead = rxResource({ stream: () => this.api.campaigns() });
  protected readonly preview = localCopy<ReminderPreview>(this.previewRead, true);
  protected readonly loading = this.previewRead.isLoading;
  protected readonly confirming = signal(false);
  protected readonly sending = signal(false);
  private readonly previewError = errorMessage(this.previewRead);
  private readonly sendError = signal<string | null>(null);
  protected readonly error = computed(() => this.sendError() ?? this.previewError());
  protected readonly campaign = signal<ReminderCampaignSummary | null>(null);
  protected readonly history = computed<ReminderCampaignSummary[]>(() => (this.historyRead.hasValue() ? this.historyRead.value().campaigns : []));
  protected readonly audienceCount = computed(() => this.preview()?.audience.length ?? 0);
  protected readonly progressPct = computed(() => {
    const c = this.campaign();
    return c && c.audienceCount ? Math.round(((c.sent + c.failed) / c.audienceCount) * 100) : 0;
  });

  constructor() {
    // The chosen kind lives in the URL, so a link shares the exact view.
    this.route.queryParamMap.pipe(takeUntilDestroyed()).subscribe((params) => {
      const kind = params.get('kind') as ReminderKind | null;
      if (kind && REMINDER_KINDS.includes(kind)) this.load(kind);
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
    this.api.send(p.kind, p.audience.length).subscribe({
      next: (c) => {
        this.sending.set(false);
        this.confirming.set(false);
        this.campaign.set(c);
        this.watch(c.id);
      },
      error: (err: unknown) => {
        this.sending.set(false);
        const e = toApiError(err);
        this.sendError.set(e.message);
        // The audience moved under us: show the new list before anyone sends again.
        if (e.code === 'audience_changed') this.load(p.kind);
      },
    });
  }

  private watch(id: string): void {
    this.polling?.unsubscribe();
    this.polling = timer(0, 1000)
      .pipe(
        switchMap(() => this.api.campaign(id)),
        takeWhile((c) => c.pending > 0, true),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (c) => this.campaign.set(c),
        complete: () => {
          this.loadHistory();
          const kind = this.selected();
          if (kind) this.load(kind);
        },
      });
  }

  private loadHistory(): void {
    this.historyRead.reload();
  }
}
