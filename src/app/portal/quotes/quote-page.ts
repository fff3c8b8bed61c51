import { ChangeDetectionStrategy, Component, computed, effect, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Title } from '@angular/platform-browser';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import { QUOTE_STATUS_LABELS } from '../../../../shared/pricebook';
import type { QuoteApprove, QuoteDecline, QuoteView } from '../../../../shared/schemas/pricebook';
import { errorMessage, localCopy } from '../../core/resource-state';
import { QuoteApproval } from '../../ui/quote-approval';
import { QuoteOptionTable } from '../../ui/quote-option-table';
import { PortalQuotesApi } from './portal-quotes-api';

/** A quote from the e-mailed link: each option with the plan's coverage line by line, approve one or decline. */
import { DateTimePipe, DayPipe } from '../../ui/dates';

@Component({
  selector: 'sw-quote-page',
  imports: [DayPipe, DateTimePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, QuoteApproval, QuoteOptionTable],
  templateUrl: './quote-page.html',
  styles: `
    :host {
      display: block;
      max-width: 760px;
      margin: 0 auto;
      padding: 16px;
    }
    h1 {
      overflow-wrap: anywhere;
    }
    h2 {
      font-size: 1.2rem;
      font-weight: 800;
      margin: 0 0 4px;
    }
    .option {
      border: 1px solid var(--sw-teal-soft);
      border-radius: var(--sw-radius);
      padding: 10px 12px;
      margin: 0 0 12px;
    }
    .option.chosen {
      border: 2px solid var(--sw-ok);
    }
    .notes {
      padding-left: 20px;
    }
    .photos {
      list-style: none;
      padding: 0;
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(120px, 1fr));
      gap: 8px;
    }
    .photos img {
      width: 100%;
      aspect-ratio: 4 / 3;
      object-fit: cover;
      border-radius: 8px;
    }
    .ok {
      color: var(--sw-ok);
      font-weight: 700;
    }
    .note {
      white-space: pre-line;
      background: var(--sw-teal-soft);
      padding: 8px 12px;
      border-radius: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QuotePage {
  private readonly api = inject(PortalQuotesApi);
  private readonly title = inject(Title);
  readonly id = input.required<string>();
  protected readonly usd = (c: number) => formatUsd(c);
  protected readonly labels = QUOTE_STATUS_LABELS;
  private readonly read = rxResource({ params: () => this.id(), stream: ({ params }) => this.api.get(params) });
  protected readonly quote = localCopy<QuoteView>(this.read);
  protected readonly error = errorMessage(this.read);
  protected readonly name = computed(() => {
    const q = this.quote();
    return q ? `Quote ${q.number ? `Q-${q.number}` : ''} for ${q.customerName}`.replace('  ', ' ') : 'Quote';
  });
  protected readonly approvedTitle = computed(() => {
    const q = this.quote();
    return q?.approval ? (q.options.find((o) => o.id === q.approval!.optionId)?.title ?? '') : '';
  });

  constructor() {
    effect(() => this.title.setTitle(`${this.name()} · Seasonwell`));
  }

  protected readonly decide = (kind: 'approve' | 'decline', body: Record<string, unknown>) => {
    const id = this.id();
    return firstValueFrom(kind === 'approve' ? this.api.approve(id, body as QuoteApprove) : this.api.decline(id, body as QuoteDecline));
  };

  protected onDecided(view: QuoteView): void {
    this.quote.set(view);
  }
}
