import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { Caution, ReadingCheck, VisitReadings } from '../../../../shared/hvac';
import { capacityState, FULL_CAPACITY_TEST_PROMPT } from '../../../../shared/hvac/capacity';
import { cautions as ALL_CAUTIONS } from '../../../../shared/hvac/cautions';
import { ReadingInputError } from '../../../../shared/hvac/errors';
import { REFRIGERANTS } from '../../../../shared/hvac/refrigerant-names';
import { CHECK_LABELS } from '../../../../shared/checklist';
import type { FieldEquipment, SavedReadings } from '../../../../shared/schemas/field';
import { toApiError } from '../../core/api-errors';
import { lazyModule } from '../../core/lazy-module';
import { ReadingStatusMark } from '../../ui/status/reading-status';
import { FieldApi } from '../field-api';
import { VisitDrafts } from '../visit-drafts';
import { CautionNote } from './caution-note';
import {
  CAUTION_FOR_GROUP,
  CHECK_GROUP,
  FIELD_HELP,
  GROUP_TITLES,
  PART_CAPACITY_GROUPS,
  GROUPS_BY_MODE,
  READING_FIELDS,
  evaluateTyped,
  getPath,
  setPath,
  toNumber,
  type ReadingField,
  type ReadingGroup,
} from './reading-fields';
import { firstValueFrom } from 'rxjs';
import { timeLabel } from '../../ui/dates';
import { Session } from '../../core/session';

type Mode = 'cooling' | 'heating';
interface Draft {
  mode: Mode;
  refrigerant: string;
  meteringDevice: string;
  airflowBasis?: string;
  fullCapacityTest?: boolean;
  values: Record<string, string>;
}
type SaveState = { kind: 'idle' } | { kind: 'saving' } | { kind: 'saved'; at: string } | { kind: 'kept'; message: string } | { kind: 'error'; message: string };

const isInputError = (e: unknown): e is ReadingInputError => e instanceof ReadingInputError;
// The readings engine (its zod schema, saturation tables and psychrometrics) loads in a chunk of
// its own beside the form; the checks appear as soon as it is in.
const engine = lazyModule(() => import('../../../../shared/hvac/evaluate'));
const OUTDOOR = new Set(['condensing_unit', 'heat_pump', 'geothermal_heat_pump', 'ductless']);

/** Readings for one system, checked by the engine as each field is typed, saved with the visit. */
@Component({
  selector: 'sw-readings-form',
  imports: [ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule, ReadingStatusMark, CautionNote],
  templateUrl: './readings-form.html',
  styleUrl: './readings-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReadingsForm {
  private readonly api = inject(FieldApi);
  private readonly session = inject(Session);
  private readonly drafts = inject(VisitDrafts);

  readonly visitId = input.required<string>();
  readonly equipment = input.required<FieldEquipment[]>();
  readonly saved = input<SavedReadings[]>([]);
  readonly cautions = input<Caution[]>([]);
  readonly season = input<Mode>('cooling');
  readonly locked = input(false);
  /** The property's elevation: the server uses it too, so live and saved verdicts match. */
  readonly altitudeFt = input<number | null>(null);
  readonly savedReadings = output<SavedReadings>();

  protected readonly refrigerants = REFRIGERANTS;
  protected readonly help = FIELD_HELP;
  protected readonly fullCapacityPrompt = FULL_CAPACITY_TEST_PROMPT.charAt(0).toUpperCase() + FULL_CAPACITY_TEST_PROMPT.slice(1) + '.';
  protected readonly groupTitles = GROUP_TITLES;
  protected readonly checkLabels = CHECK_LABELS;
  protected readonly controls: Record<string, FormControl<string>> = Object.fromEntries(READING_FIELDS.map((f) => [f.path, new FormControl('', { nonNullable: true })]));
  protected readonly form = new FormGroup({
    equipmentId: new FormControl('', { nonNullable: true }),
    mode: new FormControl<Mode>('cooling', { nonNullable: true }),
    refrigerant: new FormControl('', { nonNullable: true }),
    meteringDevice: new FormControl('', { nonNullable: true }),
    airflowBasis: new FormControl('', { nonNullable: true }),
    fullCapacityTest: new FormControl(false, { nonNullable: true }),
    values: new FormGroup(this.controls),
  });

  /** Systems that take readings: outdoor units, furnaces and air handlers. */
  protected readonly systems = computed(() => this.equipment().filter((e) => OUTDOOR.has(e.kind) || e.kind === 'gas_furnace' || e.kind === 'air_handler'));
  private readonly value = signal(this.form.getRawValue());
  protected readonly mode = computed(() => this.value().mode);
  /** The chosen system's record: its compressor type decides the capacity fields. */
  protected readonly system = computed(() => this.equipment().find((e) => e.id === this.value().equipmentId) ?? null);
  protected readonly compressorType = computed(() => this.system()?.compressorType ?? null);
  protected readonly partCapacity = computed(() => this.compressorType() === 'variable_speed' || this.compressorType() === 'two_stage');
  protected readonly groups = computed(() => GROUPS_BY_MODE[this.mode()].filter((g) => this.partCapacity() || !PART_CAPACITY_GROUPS.has(g)));
  protected readonly fieldsByGroup = (g: ReadingGroup): ReadingField[] => READING_FIELDS.filter((f) => f.group === g && (!f.only || f.only === this.compressorType()));
  protected readonly helpByGroup = (g: ReadingGroup): { label: string; text: string }[] =>
    this.fieldsByGroup(g).flatMap((f) => (this.help[f.path] ? [{ label: f.label, text: this.help[f.path]! }] : []));
  protected readonly state = signal<SaveState>({ kind: 'idle' });
  protected readonly restored = signal(false);
  private readonly serverErrors = signal<Record<string, string>>({});

  /** What is typed, as the engine's input, plus per-field typing errors. */
  private readonly typed = computed(() => {
    const v = this.value();
    const readings: Record<string, unknown> = { mode: v.mode };
    const errors: Record<string, string> = {};
    if (v.refrigerant) readings['refrigerant'] = v.refrigerant;
    if (v.meteringDevice) readings['meteringDevice'] = v.meteringDevice;
    if (v.airflowBasis) readings['airflowBasis'] = v.airflowBasis;
    const altitude = this.altitudeFt();
    if (altitude !== null) readings['altitudeFt'] = altitude;
    const type = this.compressorType();
    if (type) readings['compressorType'] = type;
    if (type === 'variable_speed' || type === 'two_stage') readings['fullCapacityTest'] = v.fullCapacityTest;
    for (const f of READING_FIELDS) {
      if (f.only && f.only !== type) continue;
      const n = toNumber(v.values[f.path] ?? '');
      if (n === 'bad') errors[f.path] = 'Enter a number';
      else if (n !== null) setPath(readings, f.path, n);
    }
    // A half-entered band is not a band yet.
    for (const band of ['manufacturerSuperheatRangeF', 'riseRangeF']) {
      const b = readings[band] as { min?: number; max?: number } | undefined;
      if (b && (b.min === undefined || b.max === undefined)) delete readings[band];
    }
    return { readings: readings as VisitReadings, errors };
  });

  protected readonly evaluation = computed(() => {
    const { readings, errors } = this.typed();
    // Until the engine is in (a moment after the form) only typing errors show.
    const run = engine.value()?.evaluateReadings;
    const result = run ? evaluateTyped(readings, run, isInputError) : { checks: [], errors: {} };
    return { checks: result.checks, errors: { ...result.errors, ...errors, ...this.serverErrors() } };
  });
  protected readonly checksByGroup = computed(() => {
    const out: Partial<Record<ReadingGroup, ReturnType<typeof this.evaluation>['checks']>> = {};
    for (const c of this.evaluation().checks) (out[CHECK_GROUP[c.check] ?? 'air'] ??= []).push(c);
    return out;
  });
  /** The capacity the readings are taken at, with the percent worked out from the frequency. */
  protected readonly capacity = computed(() => {
    if (!this.partCapacity()) return null;
    const r = this.typed().readings;
    try {
      const state = capacityState(r);
      const pct = state.pct === null ? null : Math.round(state.pct);
      let text: string;
      if (state.forcedFull) text = 'Forced to full capacity (test mode): 100 %.';
      else if (pct === null) text = 'Enter the frequency or the percent of capacity.';
      else if (state.pctFromFrequency) text = `Running at ${pct} % of full capacity (${r.compressorHz} of ${r.maxCompressorHz} Hz).`;
      else text = `Running at ${pct} % of full capacity.`;
      return { text, prompt: !state.judgeCharge };
    } catch {
      return { text: 'Check the frequency against the model maximum.', prompt: this.compressorType() === 'variable_speed' && !r.fullCapacityTest };
    }
  });
  protected readonly alertCount = computed(() => this.evaluation().checks.filter((c) => c.status === 'alert').length);
  protected readonly hasErrors = computed(() => Object.keys(this.evaluation().errors).length > 0);

  constructor() {
    engine.preload();
    const sub = this.form.valueChanges.subscribe(() => {
      this.value.set(this.form.getRawValue());
      this.serverErrors.set({});
      if (this.state().kind === 'saved') this.state.set({ kind: 'idle' });
      this.keepDraft();
    });
    inject(DestroyRef).onDestroy(() => sub.unsubscribe());

    // First system by default; its saved readings or a draft from this phone fill the form.
    effect(() => {
      const systems = this.systems();
      untracked(() => {
        if (!this.form.controls.equipmentId.value && systems[0]) this.load(systems[0].id);
      });
    });
    effect(() => (this.locked() ? this.form.disable({ emitEvent: false }) : this.form.enable({ emitEvent: false })));

    // Back online with readings kept on the phone: send them.
    const online = () => {
      if (this.state().kind === 'kept') void this.save();
    };
    window.addEventListener('online', online);
    inject(DestroyRef).onDestroy(() => window.removeEventListener('online', online));
  }

  protected chooseSystem(id: string): void {
    this.load(id);
  }

  private draftPart(equipmentId: string): string {
    return `readings.${equipmentId}`;
  }

  /** The system whose readings the form holds. */
  private loadedId: string | null = null;

  private load(equipmentId: string): void {
    this.loadedId = equipmentId;
    const system = this.equipment().find((e) => e.id === equipmentId);
    const draft = this.drafts.read<Draft>(this.visitId(), this.draftPart(equipmentId));
    const saved = this.saved().find((s) => s.equipmentId === equipmentId);
    const values: Record<string, string> = Object.fromEntries(READING_FIELDS.map((f) => [f.path, '']));
    let mode: Mode = this.season();
    let refrigerant = system?.refrigerant ?? '';
    let meteringDevice = system?.meteringDevice ?? '';
    let airflowBasis = '';
    let fullCapacityTest = false;
    if (draft) {
      Object.assign(values, draft.values);
      ({ mode, refrigerant, meteringDevice } = draft);
      airflowBasis = draft.airflowBasis ?? '';
      fullCapacityTest = draft.fullCapacityTest ?? false;
    } else if (saved) {
      const r = saved.readings;
      for (const f of READING_FIELDS) {
        const v = getPath(r, f.path);
        if (typeof v === 'number') values[f.path] = String(v);
      }
      mode = r.mode ?? mode;
      refrigerant = r.refrigerant ?? refrigerant;
      meteringDevice = r.meteringDevice ?? meteringDevice;
      airflowBasis = r.airflowBasis ?? '';
      fullCapacityTest = r.fullCapacityTest ?? false;
    } else if (system) {
      // Nameplate figures from the equipment record save typing.
      if (system.nominalTons && OUTDOOR.has(system.kind)) values['nominalTons'] = String(system.nominalTons);
      if (system.ratedAmps && OUTDOOR.has(system.kind)) values['compressorRatedLoadAmps'] = String(system.ratedAmps);
      if (system.kind === 'gas_furnace') mode = 'heating';
    }
    // The model's limits from the record, unless typed or saved otherwise.
    if (system?.compressorType === 'variable_speed' && system.maxCompressorHz && !values['maxCompressorHz']) values['maxCompressorHz'] = String(system.maxCompressorHz);
    if (system?.maxExternalStaticInWc && !values['maxExternalStaticInWc']) values['maxExternalStaticInWc'] = String(system.maxExternalStaticInWc);
    this.form.setValue({ equipmentId, mode, refrigerant, meteringDevice, airflowBasis, fullCapacityTest, values }, { emitEvent: false });
    this.value.set(this.form.getRawValue());
    this.restored.set(!!draft);
    this.state.set(
      draft ? { kind: 'kept', message: 'Readings restored from this phone; not saved to the office yet.' } : saved ? { kind: 'saved', at: saved.recordedAt } : { kind: 'idle' },
    );
  }

  private keepDraft(): void {
    const v = this.form.getRawValue();
    // Choosing another system changes the control before load() fills the form: what is in the form
    // then still belongs to the system before, and must not become the new one's draft.
    if (!v.equipmentId || v.equipmentId !== this.loadedId) return;
    const draft: Draft = {
      mode: v.mode,
      refrigerant: v.refrigerant,
      meteringDevice: v.meteringDevice,
      airflowBasis: v.airflowBasis,
      fullCapacityTest: v.fullCapacityTest,
      values: v.values,
    };
    this.drafts.write(this.visitId(), this.draftPart(v.equipmentId), draft);
  }

  protected async save(): Promise<void> {
    const v = this.form.getRawValue();
    if (!v.equipmentId || this.state().kind === 'saving') return;
    this.keepDraft();
    this.state.set({ kind: 'saving' });
    try {
      const res = await firstValueFrom(this.api.saveReadings(this.visitId(), { equipmentId: v.equipmentId, readings: this.typed().readings }));
      this.drafts.clear(this.visitId(), this.draftPart(v.equipmentId));
      this.restored.set(false);
      this.state.set({ kind: 'saved', at: res.recordedAt });
      this.savedReadings.emit(res);
    } catch (err) {
      const e = toApiError(err);
      if (e.status === 0 || e.status >= 500) {
        this.state.set({ kind: 'kept', message: 'No connection: the readings are kept on this phone and will be sent when the signal is back.' });
        return;
      }
      const fields: Record<string, string> = {};
      for (const [k, m] of Object.entries(e.fields)) fields[k.replace(/^readings\./, '')] = m;
      this.serverErrors.set(fields);
      this.state.set({ kind: 'error', message: e.message });
    }
  }

  protected errorFor(path: string): string | undefined {
    return this.evaluation().errors[path];
  }

  protected cautionFor(group: ReadingGroup): Caution | undefined {
    const id = CAUTION_FOR_GROUP[group];
    return id ? this.cautions().find((c) => c.id === id) : undefined;
  }

  /** The caution a reading calls for (a hazardous CO level), whether or not the visit lists it. */
  protected checkCaution(c: ReadingCheck): Caution | undefined {
    if (!c.caution) return undefined;
    return this.cautions().find((x) => x.id === c.caution) ?? ALL_CAUTIONS.find((x) => x.id === c.caution);
  }

  protected band(c: { expected: { min?: number; max?: number; target?: number }; unit: string }): string {
    const { min, max, target } = c.expected;
    if (min !== undefined && max !== undefined) return `Expected ${min}–${max} ${c.unit}`;
    if (max !== undefined) return `Up to ${max} ${c.unit}`;
    if (target !== undefined) return `Target ${target} ${c.unit}`;
    return 'No band yet';
  }

  protected readonly stateView = computed(() => {
    const s = this.state();
    switch (s.kind) {
      case 'saved':
        return { icon: 'check', text: `Saved ${timeLabel(s.at, this.session.timeZone())}; checked again by the office system.`, bad: false };
      case 'kept':
        return { icon: 'warning', text: s.message, bad: false };
      case 'error':
        return { icon: 'status-alert', text: s.message, bad: true };
      default:
        return null;
    }
  });
}
