import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { catchError, debounceTime, distinctUntilChanged, of, switchMap } from 'rxjs';
import { VisitRequest } from '../../portal/booking/visit-request';
import { DispatchApi, type Household } from './dispatch-api';

/** The office books for a caller on the phone: find the household, then the same steps and engine. */
@Component({
  selector: 'sw-caller-booking',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, VisitRequest],
  template: `
    <a mat-button routerLink="/office/dispatch"><mat-icon svgIcon="arrow_back" aria-hidden="true" /> Dispatch board</a>
    @if (chosen(); as h) {
      <p class="who">
        Caller: <strong>{{ h.name }}</strong> {{ h.phone }}
        <button mat-button type="button" (click)="chosen.set(null)">Change household</button>
      </p>
      <sw-visit-request [customerId]="h.id" [forCaller]="true" />
    } @else {
      <h1>Book a visit for a caller</h1>
      <p class="sw-lead">Find the caller’s household, then pick an arrival window with them.</p>
      <mat-form-field appearance="outline" class="search">
        <mat-label>Find the household</mat-label>
        <input matInput [formControl]="query" autocomplete="off" />
        <mat-hint>Name, e-mail, phone or street</mat-hint>
      </mat-form-field>
      <ul class="results">
        @for (h of results(); track h.id) {
          <li>
            <button mat-stroked-button type="button" (click)="chosen.set(h)">{{ h.name }} · {{ h.phone ?? h.email ?? '' }}</button>
          </li>
        }
      </ul>
    }
  `,
  styles: `
    :host {
      display: block;
      padding: 12px;
    }
    .search {
      width: min(480px, 100%);
    }
    .results {
      list-style: none;
      padding: 0;
      display: flex;
      flex-direction: column;
      gap: 6px;
      align-items: flex-start;
    }
    .who {
      display: flex;
      gap: 8px;
      align-items: center;
      flex-wrap: wrap;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CallerBooking {
  private readonly api = inject(DispatchApi);
  protected readonly query = new FormControl('', { nonNullable: true });
  protected readonly chosen = signal<Household | null>(null);
  protected readonly results = toSignal(
    this.query.valueChanges.pipe(
      debounceTime(250),
      distinctUntilChanged(),
      switchMap((q) => (q.trim().length < 2 ? of([]) : this.api.households(q.trim()).pipe(catchError(() => of([] as Household[]))))),
    ),
    { initialValue: [] as Household[] },
  );
}
