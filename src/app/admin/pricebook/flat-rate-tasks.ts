import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import { applyServerErrors, serverError } from '../../core/form-errors';
import { PriceBookApi } from './price-book-api';

const component = () => new FormGroup({ itemId: new FormControl('', { nonNullable: true }), quantity: new FormControl('1', { nonNullable: true }) });

/** Flat-rate tasks: a named bundle of parts and labor, priced as the sum of its items. */
@Component({
  selector: 'sw-flat-rate-tasks',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <h2>Flat-rate tasks</h2>
    <ul class="tasks" aria-label="Flat-rate tasks">
      @for (t of tasks(); track t.id) {
        <li>
          <strong>{{ t.sku }} · {{ t.name }}</strong> · {{ usd(t.priceCents) }}{{ t.active ? '' : ' · retired' }}<br /><small>{{ componentsOf(t.id) }}</small>
        </li>
      } @empty {
        <li>No flat-rate tasks yet. Add one below, such as "Replace run capacitor": the capacitor and the labor to fit it.</li>
      }
    </ul>
    <form [formGroup]="form" (ngSubmit)="save()" aria-label="New flat-rate task">
      <h3>New flat-rate task</h3>
      <div class="grid">
        <mat-form-field appearance="outline"
          ><mat-label>Task SKU</mat-label><input matInput formControlName="sku" />
          @if (err('sku'); as e) {
            <mat-error>{{ e }}</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline"
          ><mat-label>Task name</mat-label><input matInput formControlName="name" />
          @if (err('name'); as e) {
            <mat-error>{{ e }}</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline" class="wide"><mat-label>What the homeowner reads</mat-label><input matInput formControlName="description" /></mat-form-field>
      </div>
      <div formArrayName="components">
        @for (c of form.controls.components.controls; track c; let i = $index) {
          <div class="grid" [formGroupName]="i">
            <mat-form-field appearance="outline">
              <mat-label>Item {{ i + 1 }}</mat-label>
              <mat-select formControlName="itemId">
                @for (it of items(); track it.id) {
                  <mat-option [value]="it.id">{{ it.sku }} · {{ it.name }} · {{ usd(it.unitCents) }}</mat-option>
                }
              </mat-select>
              @if (err('components.' + i + '.itemId'); as e) {
                <mat-error>{{ e }}</mat-error>
              }
            </mat-form-field>
            <mat-form-field appearance="outline"
              ><mat-label>Quantity {{ i + 1 }}</mat-label
              ><input matInput formControlName="quantity" inputmode="decimal" />
              @if (err('components.' + i + '.quantity'); as e) {
                <mat-error>{{ e }}</mat-error>
              }
            </mat-form-field>
          </div>
        }
      </div>
      <div class="buttons">
        <button mat-button type="button" (click)="form.controls.components.push(newComponent())">Add another item</button>
        <button mat-flat-button type="submit" [disabled]="busy()">Add the task</button>
      </div>
      @if (message(); as m) {
        <p role="status" [class]="m.kind">{{ m.text }}</p>
      }
    </form>
  `,
  styles: `
    .tasks {
      padding-left: 20px;
    }
    small {
      color: var(--mat-sys-on-surface-variant);
    }
    form {
      border: 1px solid var(--sw-teal-soft);
      border-radius: var(--sw-radius);
      padding: 8px 12px;
      margin: 12px 0;
    }
    .grid {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(220px, 1fr));
      gap: 0 12px;
    }
    .buttons {
      display: flex;
      gap: 12px;
    }
    h2,
    h3 {
      font-size: 1.1rem;
      font-weight: 800;
    }
    .ok {
      color: var(--sw-ok);
      font-weight: 700;
    }
    .bad {
      color: var(--sw-alert);
      font-weight: 700;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FlatRateTasks {
  private readonly api = inject(PriceBookApi);
  protected readonly usd = (c: number) => formatUsd(c);
  protected readonly newComponent = component;
  private readonly read = rxResource({ stream: () => this.api.tasks() });
  private readonly itemsRead = rxResource({ stream: () => this.api.items({ status: 'active', pageSize: 100 }) });
  protected readonly tasks = computed(() => (this.read.hasValue() ? this.read.value() : []));
  protected readonly items = computed(() => (this.itemsRead.hasValue() ? this.itemsRead.value().items : []));
  protected readonly componentsOf = (id: string) =>
    this.tasks()
      .find((t) => t.id === id)
      ?.components.map((c) => `${c.quantity} × ${c.name}`)
      .join(', ') ?? '';
  protected readonly busy = signal(false);
  protected readonly message = signal<{ kind: 'ok' | 'bad'; text: string } | null>(null);
  protected readonly form = new FormGroup({
    sku: new FormControl('', { nonNullable: true }),
    name: new FormControl('', { nonNullable: true }),
    description: new FormControl('', { nonNullable: true }),
    components: new FormArray([component(), component()]),
  });
  protected readonly err = (path: string) => serverError(this.form.get(path));

  protected async save(): Promise<void> {
    const v = this.form.getRawValue();
    this.busy.set(true);
    this.message.set(null);
    try {
      const task = await firstValueFrom(
        this.api.createTask({
          sku: v.sku,
          name: v.name,
          description: v.description,
          active: true,
          components: v.components.filter((c) => c.itemId).map((c) => ({ itemId: c.itemId, quantity: Number(c.quantity) })),
        }),
      );
      this.message.set({ kind: 'ok', text: `${task.name} added at ${formatUsd(task.priceCents)}.` });
      this.form.reset();
      this.read.reload();
    } catch (e) {
      this.message.set({ kind: 'bad', text: applyServerErrors(this.form, e) ?? 'Check the values marked above.' });
    } finally {
      this.busy.set(false);
    }
  }
}
