import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { fromEvent, merge } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import type { OfficeHome as OfficeHomeData } from '../../../../shared/schemas/home';
import { VISIT_STATUSES, VISIT_STATUS_LABELS, type VisitStatus } from '../../../../shared/visits';
import { errorMessage, localCopy } from '../../core/resource-state';
import { WriteActivity } from '../../core/write-activity';
import { AreaLanding, type AreaTile } from '../../ui/area-landing';
import { OfficeHomeApi } from './office-home-api';

interface Card {
  id: string;
  title: string;
  count: number;
  detail: string;
  link: string;
  query: Partial<Record<string, string>>;
  linkText: string;
  icon: string;
}

/** The office's first screen: today's work and the money at risk, each a count linking to its table. */
@Component({
  selector: 'sw-office-home',
  imports: [AreaLanding, MatCardModule, MatIconModule, RouterLink],
  host: { class: 'sw-dense' },
  templateUrl: './office-home.html',
  styleUrl: './office-home.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OfficeHome {
  private readonly api = inject(OfficeHomeApi);
  private readonly activity = inject(WriteActivity);
  /** Bumped when the tab gets focus again: someone else may have booked or paid meanwhile. */
  private readonly focused = signal(0);
  private readonly read = rxResource({ params: () => ({ w: this.activity.writes(), f: this.focused() }), stream: () => this.api.load() });
  protected readonly home = localCopy<OfficeHomeData>(this.read, true);
  protected readonly error = errorMessage(this.read);

  constructor() {
    if (typeof window !== 'undefined') {
      merge(fromEvent(window, 'focus'), fromEvent(document, 'visibilitychange'))
        .pipe(takeUntilDestroyed(inject(DestroyRef)))
        .subscribe(() => {
          if (document.visibilityState !== 'hidden') this.focused.update((n) => n + 1);
        });
    }
  }

  protected readonly cards = computed<Card[]>(() => {
    const h = this.home();
    if (!h) return [];
    const usd = formatUsd;
    return [
      {
        id: 'today',
        title: "Today's visits",
        count: total(h.visitsToday),
        detail: byStatus(h.visitsToday),
        link: '/office/dispatch',
        query: { from: h.today, days: '1' },
        linkText: 'Open today on the board',
        icon: 'calendar',
      },
      {
        id: 'tomorrow',
        title: "Tomorrow's visits",
        count: total(h.visitsTomorrow),
        detail: byStatus(h.visitsTomorrow),
        link: '/office/dispatch',
        query: { from: h.tomorrow, days: '1' },
        linkText: 'Open tomorrow on the board',
        icon: 'calendar',
      },
      {
        id: 'unassigned',
        title: 'Unassigned queue',
        count: h.unassigned,
        detail: 'Requests to confirm and visits with no technician, any date.',
        link: '/office/dispatch',
        query: { from: h.today, days: '1' },
        linkText: 'Assign them on the board',
        icon: 'dispatch',
      },
      {
        id: 'due30',
        title: 'Renewals due in 30 days',
        count: h.renewalsDue30.count,
        detail: `${usd(h.renewalsDue30.totalCents)} in plan fees.`,
        link: '/office/renewals',
        query: { view: 'due30' },
        linkText: 'See who is due',
        icon: 'shield',
      },
      {
        id: 'past-due',
        title: 'Past-due agreements',
        count: h.pastDue.count,
        detail: `${usd(h.pastDue.totalCents)} unpaid; benefits paused until paid.`,
        link: '/office/renewals',
        query: { view: 'past_due' },
        linkText: 'Follow them up',
        icon: 'warning',
      },
      {
        id: 'payments',
        title: 'Payments this week',
        count: h.recentPayments.count,
        detail: `${usd(h.recentPayments.totalCents)} received in the last ${h.recentPaymentDays} days.`,
        link: '/office/invoices',
        query: { status: 'paid' },
        linkText: 'See paid invoices',
        icon: 'receipt',
      },
      {
        id: 'quotes',
        title: 'Open quotes',
        count: h.openQuotes.count,
        detail: `${usd(h.openQuotes.totalCents)} if each is approved at its dearest option.`,
        link: '/office/quotes',
        query: {},
        linkText: 'See open quotes',
        icon: 'wrench',
      },
      {
        id: 'campaigns',
        title: 'Running campaigns',
        count: h.runningCampaigns,
        detail: 'Reminder campaigns sending, scheduled or paused.',
        link: '/office/reminders',
        query: {},
        linkText: 'See their progress',
        icon: 'bell',
      },
    ];
  });

  protected readonly tiles: AreaTile[] = [
    { title: 'Households', text: 'Each household with its homes, equipment, plan and history.', icon: 'people', path: '/office/customers' },
    { title: 'Dispatch', text: 'The day and week board: assign visits to technicians.', icon: 'dispatch', path: '/office/dispatch' },
    { title: 'Renewals', text: 'Agreements coming due, past due and lapsed.', icon: 'shield', path: '/office/renewals' },
    { title: 'Quotes', text: 'Open quotes with their age and value, and how many are approved.', icon: 'wrench', path: '/office/quotes' },
    { title: 'Truck stock', text: 'The restock list, restocks and transfers between trucks and the shop.', icon: 'truck', path: '/office/stock' },
    { title: 'Reminders', text: 'Seasonal tune-up, filter and coil-cleaning reminders.', icon: 'bell', path: '/office/reminders' },
    { title: 'Reports', text: 'Agreements, revenue, visits and technician utilisation over time.', icon: 'chart', path: '/office/reports' },
  ];
}

const total = (m: Partial<Record<VisitStatus, number>>) => Object.values(m).reduce((a, b) => a + (b ?? 0), 0);
function byStatus(m: Partial<Record<VisitStatus, number>>): string {
  const parts = VISIT_STATUSES.filter((s) => m[s]).map((s) => `${m[s]} ${VISIT_STATUS_LABELS[s].toLowerCase()}`);
  return parts.length ? `${parts.join(' · ')}.` : 'Nothing booked.';
}
