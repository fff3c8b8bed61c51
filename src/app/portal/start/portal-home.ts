import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import type { HomeSummary } from '../../../../shared/schemas/home';
import { errorMessage, localCopy } from '../../core/resource-state';
import { MyHomeApi } from '../home/my-home-api';
import { DueList } from '../reminders/due-list';
import type { MyHome } from '../../../../shared/schemas/customers';

interface SystemLine {
  id: string;
  name: string;
  home: string;
  age: string;
  lastService: string | null;
}

/** The homeowner's first screen: the plan, the next visit, what is owed and each system, each linking on. */
import { DayPipe } from '../../ui/dates';

@Component({
  selector: 'sw-portal-home',
  imports: [DayPipe, DueList, MatButtonModule, MatCardModule, MatIconModule, RouterLink],
  templateUrl: './portal-home.html',
  styleUrl: './portal-home.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PortalHome {
  private readonly api = inject(MyHomeApi);
  private readonly summaryRead = rxResource({ stream: () => this.api.summary() });
  private readonly homeRead = rxResource({ stream: () => this.api.load() });
  protected readonly summary = localCopy<HomeSummary>(this.summaryRead);
  protected readonly home = localCopy<MyHome>(this.homeRead);
  protected readonly error = computed(() => errorMessage(this.summaryRead)() ?? errorMessage(this.homeRead)());
  protected readonly usd = formatUsd;
  protected readonly seasonWord = { cooling: 'cooling', heating: 'heating' } as const;

  /** Each system with its age and the home's last completed visit (visits are booked per home). */
  protected readonly systems = computed<SystemLine[]>(() => {
    const h = this.home();
    if (!h) return [];
    return h.properties.flatMap((p) => {
      const last = h.past.find((v) => v.propertyId === p.id && v.status === 'done');
      return p.equipment.map((e) => ({
        id: e.id,
        name: [e.kindLabel, e.make].filter(Boolean).join(' · '),
        home: p.street,
        age: e.ageText ?? 'Age not recorded',
        lastService: last?.startsAt ?? null,
      }));
    });
  });
}
