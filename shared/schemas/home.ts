import type { AgreementStatus } from '../agreements';
import type { TuneUpSeason } from '../coverage';
import type { VisitStatus } from '../visits';

// The first screen of each role: what the homeowner and the office ask first, in one read each.

export interface HomeAgreement {
  id: string;
  propertyId: string;
  propertyLabel: string;
  planName: string;
  status: AgreementStatus;
  statusLabel: string;
  /** "Covered through March 14, 2027": the agreement's last paid day (`lastPaidTerm`), a renewal's once paid early. */
  lastDayLabel: string;
  /** Days until the latest paid term ends (exclusive end), negative once it has ended. */
  daysLeft: number;
  canRenew: boolean;
  /** This season's included tune-ups: how many, done, and left. */
  season: TuneUpSeason;
  included: number;
  used: number;
  left: number;
}

export interface HomeNextVisit {
  id: string;
  reasonLabel: string;
  status: VisitStatus;
  statusLabel: string;
  /** "Tue 1 Dec", in the company's time zone. */
  dayLabel: string;
  /** "Arrival 9–11 am". */
  arrivalLabel: string;
  technicianName: string | null;
}

export interface HomeSummary {
  agreements: HomeAgreement[];
  nextVisit: HomeNextVisit | null;
  invoicesDue: { count: number; balanceCents: number; firstId: string | null };
  /** Sent quotes the household has not answered yet, as the quotes page's waiting list. */
  quotesWaiting: { count: number; firstId: string | null };
}

export interface CountAndTotal {
  count: number;
  totalCents: number;
}

export interface OfficeHome {
  today: string;
  tomorrow: string;
  /** Visits whose arrival window opens on the day, by status (canceled left out). */
  visitsToday: Partial<Record<VisitStatus, number>>;
  visitsTomorrow: Partial<Record<VisitStatus, number>>;
  /** Requests to confirm and visits with no technician, any date (the dispatch board's queue). */
  unassigned: number;
  /** As the renewals page's "Due in 30 days" and "Past due" views. */
  renewalsDue30: CountAndTotal;
  pastDue: CountAndTotal;
  /** Payments that succeeded in the last seven days of the company's calendar, today included. */
  recentPayments: CountAndTotal;
  recentPaymentDays: number;
  /** Draft and sent quotes, each valued at its current revision's dearest option (the quotes page's "Open" view). */
  openQuotes: CountAndTotal;
  /** Reminder campaigns sending, scheduled or paused. */
  runningCampaigns: number;
}
