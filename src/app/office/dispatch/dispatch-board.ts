import { CdkDrag, CdkDragDrop, CdkDropList, CdkDropListGroup } from '@angular/cdk/drag-drop';
import { NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { BoardResponse, BoardTechnician, VisitEventView, VisitView } from '../../../../shared/schemas/booking';
import { VISIT_KINDS, VISIT_TRANSITIONS, VISIT_REASON_LABELS, VISIT_STATUS_LABELS, type VisitKind, type VisitStatus } from '../../../../shared/visits';
import { toApiError } from '../../core/api-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { urlFilters } from '../../core/url-filters';
import { VisitStatusMark } from '../../ui/status/visit-status';
import { DispatchApi } from './dispatch-api';
import { firstValueFrom } from 'rxjs';
import { addDays, dateTimeLabel, dayLabel, localDay, shortDayLabel, timeLabel, weekStart, zonedInstant } from '../../ui/dates';
import { Session } from '../../core/session';

const KIND_LABELS: Record<VisitKind, string> = { tune_up: 'Tune-up', service_call: 'Service call' };
const QUEUE = 'queue';

interface Column {
  id: string;
  tech: BoardTechnician | null;
  days: { date: string; label: string; visits: VisitView[]; off: boolean }[];
}

/** Day or week board: a column per technician, the unassigned queue, drag or menu to assign. */
@Component({
  selector: 'sw-dispatch-board',
  imports: [CdkDrag, CdkDropList, CdkDropListGroup, NgTemplateOutlet, RouterLink, MatButtonModule, MatButtonToggleModule, MatIconModule, MatMenuModule, VisitStatusMark],
  templateUrl: './dispatch-board.html',
  styleUrl: './dispatch-board.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DispatchBoard {
  private readonly api = inject(DispatchApi);
  private readonly snack = inject(MatSnackBar);
  private readonly session = inject(Session);

  protected readonly kinds = VISIT_KINDS.map((k) => ({ id: k, label: KIND_LABELS[k] }));
  /** Skills in words: "gas_furnace" reads as "gas furnace". */
  protected skillWords(skills: readonly string[] | undefined): string {
    return (skills ?? []).map((s) => s.replace(/_/g, ' ')).join(', ');
  }

  private readonly url = urlFilters();
  protected readonly from = signal(/^\d{4}-\d{2}-\d{2}$/.test(this.url.read('from') ?? '') ? this.url.read('from')! : localDay(new Date(), this.session.timeZone()));
  protected readonly days = signal<1 | 7>(this.url.read('days') === '7' ? 7 : 1);
  protected readonly technicianId = signal<string>('');
  protected readonly kind = signal<VisitKind | ''>('');
  protected readonly area = signal<string>('');
  private readonly board = rxResource({
    params: () => ({
      from: this.days() === 7 ? weekStart(this.from()) : this.from(),
      days: this.days(),
      technicianId: this.technicianId() || undefined,
      kind: this.kind() || undefined,
      area: this.area() || undefined,
    }),
    stream: ({ params }) => this.api.board(params),
  });
  /** The board stays on screen while another day or filter loads. */
  protected readonly data = localCopy<BoardResponse>(this.board, true);
  protected readonly error = errorMessage(this.board);
  protected readonly history = signal<{ visit: VisitView; events: VisitEventView[] } | null>(null);
  private readonly keepUrl = this.url.keep(() => ({ from: this.from(), days: this.days() }));
  protected readonly busy = signal(false);

  /** "12", or "50 of 180" when the server sends only the soonest of the queue. */
  protected readonly queueCount = computed(() => {
    const d = this.data();
    const shown = d?.unassigned.length ?? 0;
    const total = d?.unassignedTotal ?? shown;
    return total > shown ? `${shown} of ${total}` : String(shown);
  });
  protected readonly queueCapped = computed(() => {
    const d = this.data();
    return !!d && d.unassignedTotal > d.unassigned.length;
  });

  protected readonly title = computed(() => {
    if (this.days() === 1) return dayLabel(this.from(), this.session.timeZone(), { weekday: true });
    return `Week of ${dayLabel(weekStart(this.from()), this.session.timeZone())}`;
  });

  protected readonly columns = computed<Column[]>(() => {
    const d = this.data();
    if (!d) return [];
    const dates = Array.from({ length: d.days }, (_, i) => addDays(d.from, i));
    return d.technicians.map((t) => ({
      id: t.id,
      tech: t,
      days: dates.map((iso) => {
        // The day as the company's clock counts it (23 or 25 hours when the clocks change).
        const start = zonedInstant(iso, '00:00', d.timeZone).getTime();
        const end = zonedInstant(addDays(iso, 1), '00:00', d.timeZone).getTime() - 1;
        return {
          date: iso,
          label: shortDayLabel(iso, d.timeZone),
          visits: d.visits.filter((v) => v.technicianId === t.id && v.windowStart.slice(0, 10) === iso),
          off: t.timeOff.some((o) => Date.parse(o.startsAt) < end && Date.parse(o.endsAt) > start),
        };
      }),
    }));
  });

  /** Reads the board again after a change made from it. */
  protected load(): void {
    this.board.reload();
  }

  protected shift(step: number): void {
    this.from.set(addDays(this.from(), step * this.days()));
  }

  protected today(): void {
    this.from.set(localDay(new Date(), this.session.timeZone()));
  }

  protected pickDate(value: string): void {
    if (!/^\d{4}-\d{2}-\d{2}$/.test(value)) return;
    this.from.set(value);
  }

  protected pickKind(value: string): void {
    this.kind.set(VISIT_KINDS.find((k) => k === value) ?? '');
  }

  protected setView(days: 1 | 7): void {
    this.days.set(days);
  }

  protected dropId(techId: string | null, date?: string): string {
    return techId ? `${techId}|${date}` : QUEUE;
  }

  protected time(iso: string): string {
    return timeLabel(iso, this.data()?.timeZone ?? this.session.timeZone());
  }

  protected nextStatuses(v: VisitView): VisitStatus[] {
    return VISIT_TRANSITIONS[v.status].filter((s) => s !== 'requested');
  }

  protected eligible(v: VisitView): BoardTechnician[] {
    return this.data()?.technicians.filter((t) => t.id !== v.technicianId || v.status === 'requested') ?? [];
  }

  /** A drop on a technician's day assigns; on another day it also moves the visit, keeping its clock time. */
  protected async dropped(ev: CdkDragDrop<string, string, VisitView>): Promise<void> {
    if (ev.previousContainer === ev.container) return;
    const v = ev.item.data;
    if (ev.container.data === QUEUE) return this.assign(v, null);
    const [techId, date] = ev.container.data.split('|');
    let startsAt: string | undefined;
    if (date && v.startsAt.slice(0, 10) !== date) {
      // startsAt is written in the company's zone: its clock time is the one to keep.
      const clock = /T(\d{2}:\d{2})/.exec(v.startsAt)?.[1] ?? '00:00';
      startsAt = zonedInstant(date, clock, this.data()!.timeZone).toISOString();
    }
    await this.assign(v, techId!, startsAt);
  }

  protected async assign(v: VisitView, techId: string | null, startsAt?: string): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    try {
      const done = await firstValueFrom(this.api.assign(v.id, techId, startsAt));
      this.snack.open(techId ? `Assigned to ${done.technicianName}.` : 'Back in the unassigned queue.', 'OK', { duration: 4000 });
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 8000 });
    } finally {
      this.busy.set(false);
      this.load();
    }
  }

  protected async setStatus(v: VisitView, status: VisitStatus): Promise<void> {
    try {
      await firstValueFrom(this.api.setStatus(v.id, status));
      this.snack.open(`Marked ${VISIT_STATUS_LABELS[status].toLowerCase()}.`, 'OK', { duration: 4000 });
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 8000 });
    }
    this.load();
  }

  protected async showHistory(v: VisitView): Promise<void> {
    try {
      this.history.set({ visit: v, events: await firstValueFrom(this.api.history(v.id)) });
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 8000 });
    }
  }

  protected reasonLabel(v: VisitView): string {
    return VISIT_REASON_LABELS[v.reason];
  }

  protected kindLabel(v: VisitView): string {
    return KIND_LABELS[v.kind];
  }

  protected statusLabel(s: string): string {
    return VISIT_STATUS_LABELS[s as VisitStatus] ?? s;
  }

  protected stamp(iso: string): string {
    return dateTimeLabel(iso, this.data()?.timeZone ?? this.session.timeZone());
  }
}
