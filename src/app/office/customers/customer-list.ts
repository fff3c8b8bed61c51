import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal, viewChild, type AfterViewInit } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { catchError, debounceTime, distinctUntilChanged, map, merge, of, startWith, switchMap, tap } from 'rxjs';
import type { CustomerSummary } from '../../../../shared/schemas/customers';
import { toApiError } from '../../core/api-errors';
import { CustomersApi, type ListQuery } from './customers-api';
import { DayPipe } from '../../ui/dates';
import { PhoneLink } from '../../ui/phone-link';

/** The office's household table: server-side search as you type, sorting and paging. */
@Component({
  selector: 'sw-customer-list',
  imports: [
    PhoneLink,
    DayPipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatPaginatorModule,
    MatProgressBarModule,
    MatSortModule,
    MatTableModule,
  ],
  templateUrl: './customer-list.html',
  styleUrl: './customer-list.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CustomerList implements AfterViewInit {
  private readonly api = inject(CustomersApi);
  private readonly destroyRef = inject(DestroyRef);
  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);

  protected readonly search = new FormControl('', { nonNullable: true });
  protected readonly status = new FormControl<'active' | 'archived' | 'all'>('active', { nonNullable: true });
  protected readonly columns = ['name', 'email', 'phone', 'city', 'createdAt'];
  protected readonly rows = signal<CustomerSummary[]>([]);
  protected readonly total = signal(0);
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly query = signal<ListQuery>({});
  /** Rows the table keeps room for: a whole page, before and after the answer, so nothing below it moves. */
  protected readonly reservedRows = computed(() => this.query().pageSize ?? 25);

  ngAfterViewInit(): void {
    const sort = this.sort();
    const paginator = this.paginator();
    const typed = this.search.valueChanges.pipe(
      map((v) => v.trim()),
      debounceTime(250),
      distinctUntilChanged(),
    );
    // A new search or sort starts again at the first page.
    merge(typed, sort.sortChange, this.status.valueChanges)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe(() => (paginator.pageIndex = 0));
    merge(typed, sort.sortChange, paginator.page, this.status.valueChanges)
      .pipe(
        startWith(null),
        map((): ListQuery => ({
          q: this.search.value.trim() || undefined,
          sort: (sort.active as ListQuery['sort']) || 'name',
          dir: sort.direction || 'asc',
          page: paginator.pageIndex,
          pageSize: paginator.pageSize,
          status: this.status.value,
        })),
        tap((q) => {
          this.query.set(q);
          this.loading.set(true);
          this.error.set(null);
        }),
        // switchMap drops the answer to an older search when a newer one is on its way.
        switchMap((q) =>
          this.api.list(q).pipe(
            catchError((err: unknown) => {
              this.error.set(toApiError(err).message);
              return of(null);
            }),
          ),
        ),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe((page) => {
        this.loading.set(false);
        if (!page) return;
        this.rows.set(page.items);
        this.total.set(page.total);
      });
  }

  protected exportUrl(): string {
    return this.api.exportUrl(this.query());
  }
}
