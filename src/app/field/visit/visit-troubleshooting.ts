import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import type { FieldVisit, Troubleshooting } from '../../../../shared/schemas/field';
import { FieldApi } from '../field-api';
import { VisitDrafts } from '../visit-drafts';
import { CautionNote } from './caution-note';
import { VisitSaves, textError } from './visit-save';

type Answer = 'yes' | 'no' | '';
type TroubleKey = Exclude<keyof Troubleshooting, 'causeFound' | 'fixMade'>;

const QUESTIONS: { key: TroubleKey; text: string; when?: 'no_cooling' | 'no_heat' }[] = [
  { key: 'thermostatCalling', text: 'Is the thermostat calling?' },
  { key: 'controlVoltageAtRC', text: 'Is there 24 V at R–C?' },
  { key: 'callVoltageAtYCOutdoor', text: 'Is there 24 V at Y–C at the outdoor unit?', when: 'no_cooling' },
  { key: 'callVoltageAtWC', text: 'Is there 24 V at W–C at the furnace?', when: 'no_heat' },
  { key: 'condensateSwitchTripped', text: 'Did a condensate overflow switch trip?' },
  { key: 'breakerTripped', text: 'Is a breaker tripped?' },
  { key: 'disconnectOff', text: 'Is the disconnect off or faulty?' },
  { key: 'fuseBlown', text: 'Is a fuse blown?' },
];

const toAnswer = (v: boolean | null | undefined): Answer => (v === true ? 'yes' : v === false ? 'no' : '');
const fromAnswer = (a: Answer): boolean | null => (a === 'yes' ? true : a === 'no' ? false : null);

/** The no-cooling or no-heat questions, the cause found and the fix made. */
@Component({
  selector: 'sw-visit-troubleshooting',
  imports: [ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule, CautionNote],
  templateUrl: './visit-troubleshooting.html',
  styleUrl: './visit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitTroubleshooting {
  private readonly api = inject(FieldApi);
  private readonly drafts = inject(VisitDrafts);

  /** The visit as last loaded from the server; it has a troubleshooting kind. */
  readonly visit = input.required<FieldVisit>();
  readonly locked = input(false);

  protected readonly saves = new VisitSaves(this.drafts);
  protected readonly errorOf = (name: string) => textError(this.form.get(name));
  protected readonly kind = computed(() => this.visit().troubleshootingKind);
  protected readonly questions = computed(() => QUESTIONS.filter((q) => !q.when || q.when === this.kind()));
  protected readonly electricalCaution = computed(() => this.visit().cautions.find((c) => c.id === 'electrical_power_and_capacitors'));

  protected readonly form = new FormGroup({
    ...(Object.fromEntries(QUESTIONS.map((q) => [q.key, new FormControl<Answer>('', { nonNullable: true })])) as Record<TroubleKey, FormControl<Answer>>),
    causeFound: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
    fixMade: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
  });

  constructor() {
    // Each load fills the form from this phone's draft, else from what the server has.
    effect(() => {
      const p = this.visit();
      untracked(() => {
        const t = this.drafts.read<ReturnType<typeof this.form.getRawValue>>(p.visit.id, 'troubleshooting');
        if (t) this.form.setValue(t, { emitEvent: false });
        else if (p.troubleshooting) {
          const r = p.troubleshooting;
          this.form.setValue(
            { ...(Object.fromEntries(QUESTIONS.map((q) => [q.key, toAnswer(r[q.key])])) as Record<TroubleKey, Answer>), causeFound: r.causeFound, fixMade: r.fixMade },
            { emitEvent: false },
          );
        }
      });
    });
    effect(() => {
      if (this.locked()) this.form.disable({ emitEvent: false });
    });
    const sub = this.form.valueChanges.subscribe(() => {
      if (!this.locked()) this.drafts.write(this.visit().visit.id, 'troubleshooting', this.form.getRawValue());
    });
    inject(DestroyRef).onDestroy(() => sub.unsubscribe());
  }

  protected save(): void {
    const id = this.visit().visit.id;
    const v = this.form.getRawValue();
    const body = {
      ...(Object.fromEntries(QUESTIONS.map((q) => [q.key, fromAnswer(v[q.key])])) as Record<TroubleKey, boolean | null>),
      causeFound: v.causeFound,
      fixMade: v.fixMade,
    };
    void this.saves.run(id, 'troubleshooting', () => firstValueFrom(this.api.saveTroubleshooting(id, body)), 'Troubleshooting saved.', this.form);
  }
}
