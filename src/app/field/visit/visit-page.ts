import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import {
  CHECKLIST_RESULT_LABELS,
  CHECKLIST_RESULTS,
  type ChecklistResult,
  type ChecklistSection,
  type FieldVisit,
  type SavedReadings,
  type Troubleshooting,
} from '../../../../shared/schemas/field';
import { toApiError } from '../../core/api-errors';
import { FieldApi } from '../field-api';
import { VisitDrafts } from '../visit-drafts';
import { CautionNote } from './caution-note';
import { CoverageBanner } from './coverage-banner';
import { ReadingsForm } from './readings-form';
import { firstValueFrom } from 'rxjs';

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

interface Flash {
  kind: 'ok' | 'kept' | 'bad';
  text: string;
}

/** One visit on site: header, coverage, checklist or troubleshooting, readings, findings, completion. */
@Component({
  selector: 'sw-visit-page',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatIconModule, MatInputModule, CautionNote, CoverageBanner, ReadingsForm],
  templateUrl: './visit-page.html',
  styleUrl: './visit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitPage {
  private readonly api = inject(FieldApi);
  private readonly drafts = inject(VisitDrafts);

  /** Route parameter. */
  readonly id = input.required<string>();

  protected readonly page = signal<FieldVisit | null>(null);
  protected readonly loadError = signal<string | null>(null);
  protected readonly checklist = signal<ChecklistSection[]>([]);
  protected readonly season = signal<'cooling' | 'heating'>('cooling');
  protected readonly results = CHECKLIST_RESULTS;
  protected readonly resultLabels = CHECKLIST_RESULT_LABELS;
  protected readonly locked = computed(() => {
    const s = this.page()?.visit.status;
    return s === 'done' || s === 'canceled' || s === 'no_show';
  });
  protected readonly questions = computed(() => {
    const kind = this.page()?.troubleshootingKind;
    return QUESTIONS.filter((q) => !q.when || q.when === kind);
  });
  protected readonly caution = (id: string) => this.page()?.cautions.find((c) => c.id === id);
  protected readonly hasFuel = computed(() => !!this.page()?.equipment.some((e) => e.kind === 'gas_furnace'));

  protected readonly trouble = new FormGroup({
    ...(Object.fromEntries(QUESTIONS.map((q) => [q.key, new FormControl<Answer>('', { nonNullable: true })])) as Record<TroubleKey, FormControl<Answer>>),
    causeFound: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
    fixMade: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
  });
  protected readonly notes = new FormGroup({
    findings: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(4000)] }),
    recommendations: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(4000)] }),
  });
  protected readonly busy = signal<string | null>(null);
  protected readonly flash = signal<Record<string, Flash>>({});

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => void this.load(id));
    });
    this.trouble.valueChanges.subscribe(() => this.keep('troubleshooting', this.trouble.getRawValue()));
    this.notes.valueChanges.subscribe(() => this.keep('notes', this.notes.getRawValue()));
  }

  private keep(part: string, value: unknown): void {
    const p = this.page();
    if (p && !this.locked()) this.drafts.write(p.visit.id, part, value);
  }

  private setFlash(part: string, f: Flash | null): void {
    const next = { ...this.flash() };
    if (f) next[part] = f;
    else delete next[part];
    this.flash.set(next);
  }

  protected async load(id: string, season?: 'cooling' | 'heating'): Promise<void> {
    this.loadError.set(null);
    try {
      const p = await firstValueFrom(this.api.visit(id, season));
      this.page.set(p);
      this.season.set(p.season);
      this.checklist.set(this.drafts.read<ChecklistSection[]>(id, `checklist.${p.season}`) ?? p.checklist);
      const t = this.drafts.read<ReturnType<typeof this.trouble.getRawValue>>(id, 'troubleshooting');
      if (t) this.trouble.setValue(t, { emitEvent: false });
      else if (p.troubleshooting) {
        const r = p.troubleshooting;
        this.trouble.setValue(
          { ...(Object.fromEntries(QUESTIONS.map((q) => [q.key, toAnswer(r[q.key])])) as Record<TroubleKey, Answer>), causeFound: r.causeFound, fixMade: r.fixMade },
          { emitEvent: false },
        );
      }
      const n = this.drafts.read<{ findings: string; recommendations: string }>(id, 'notes');
      this.notes.setValue(n ?? { findings: p.visit.findings, recommendations: p.visit.recommendations }, { emitEvent: false });
      if (this.locked()) {
        this.trouble.disable({ emitEvent: false });
        this.notes.disable({ emitEvent: false });
      }
    } catch (err) {
      this.loadError.set(toApiError(err).message);
    }
  }

  protected async switchSeason(season: 'cooling' | 'heating'): Promise<void> {
    const p = this.page();
    if (!p || season === this.season()) return;
    await this.load(p.visit.id, season);
  }

  protected setResult(section: ChecklistSection, itemId: string, result: ChecklistResult): void {
    const p = this.page();
    if (!p || this.locked()) return;
    const next = this.checklist().map((s) =>
      s.equipmentId !== section.equipmentId ? s : { ...s, items: s.items.map((i) => (i.id === itemId ? { ...i, result: i.result === result ? null : result } : i)) },
    );
    this.checklist.set(next);
    this.drafts.write(p.visit.id, `checklist.${this.season()}`, next);
  }

  protected setNote(section: ChecklistSection, itemId: string, note: string): void {
    const p = this.page();
    if (!p) return;
    const next = this.checklist().map((s) => (s.equipmentId !== section.equipmentId ? s : { ...s, items: s.items.map((i) => (i.id === itemId ? { ...i, note } : i)) }));
    this.checklist.set(next);
    this.drafts.write(p.visit.id, `checklist.${this.season()}`, next);
  }

  protected doneCount(section: ChecklistSection): number {
    return section.items.filter((i) => i.result !== null).length;
  }

  private async run(part: string, work: () => Promise<unknown>, ok: string, onFields?: (fields: Record<string, string>) => void): Promise<boolean> {
    this.busy.set(part);
    this.setFlash(part, null);
    try {
      await work();
      const p = this.page();
      if (p) this.drafts.clear(p.visit.id, part);
      this.setFlash(part, { kind: 'ok', text: ok });
      return true;
    } catch (err) {
      const e = toApiError(err);
      if (e.status === 0 || e.status >= 500) this.setFlash(part, { kind: 'kept', text: 'No connection: kept on this phone. Try again when the signal is back.' });
      else {
        onFields?.(e.fields);
        this.setFlash(part, { kind: 'bad', text: e.message });
      }
      return false;
    } finally {
      this.busy.set(null);
    }
  }

  protected saveChecklist(): void {
    const p = this.page();
    if (!p) return;
    const items = this.checklist().flatMap((s) => s.items.filter((i) => i.result !== null).map((i) => ({ equipmentId: s.equipmentId, itemId: i.id, result: i.result!, note: i.note })));
    void this.run(`checklist.${this.season()}`, async () => {
      const res = await firstValueFrom(this.api.saveChecklist(p.visit.id, { season: this.season(), items }));
      this.checklist.set(res.checklist);
    }, 'Checklist saved.');
  }

  protected saveTroubleshooting(): void {
    const p = this.page();
    if (!p) return;
    const v = this.trouble.getRawValue();
    const body = {
      ...(Object.fromEntries(QUESTIONS.map((q) => [q.key, fromAnswer(v[q.key])])) as Record<TroubleKey, boolean | null>),
      causeFound: v.causeFound,
      fixMade: v.fixMade,
    };
    void this.run('troubleshooting', () => firstValueFrom(this.api.saveTroubleshooting(p.visit.id, body)), 'Troubleshooting saved.', (fields) => this.serverErrors(this.trouble, fields));
  }

  protected saveNotes(): void {
    const p = this.page();
    if (!p) return;
    void this.run('notes', () => firstValueFrom(this.api.saveNotes(p.visit.id, this.notes.getRawValue())), 'Findings saved.', (fields) => this.serverErrors(this.notes, fields));
  }

  protected async complete(): Promise<void> {
    const p = this.page();
    if (!p) return;
    const ok = await this.run(
      'notes',
      async () => {
        const res = await firstValueFrom(this.api.complete(p.visit.id, this.notes.getRawValue()));
        this.page.set({ ...p, visit: { ...p.visit, status: res.status, statusLabel: 'Done', completedAt: res.completedAt } });
        for (const part of this.drafts.pending(p.visit.id)) this.drafts.clear(p.visit.id, part);
      },
      'Visit completed. The homeowner has been sent a summary.',
      (fields) => this.serverErrors(this.notes, fields),
    );
    if (ok) {
      this.trouble.disable({ emitEvent: false });
      this.notes.disable({ emitEvent: false });
    }
  }

  protected readonly photoCategory = new FormControl<'problem' | 'nameplate'>('problem', { nonNullable: true });
  protected readonly photoCaption = new FormControl('', { nonNullable: true, validators: [Validators.maxLength(200)] });

  protected async addPhotos(input: HTMLInputElement): Promise<void> {
    const p = this.page();
    const chosen = [...(input.files ?? [])];
    if (!p || !chosen.length) return;
    const ok = await this.run('photos', async () => {
      const stored = await firstValueFrom(this.api.uploadPhotos(p.visit.id, chosen, this.photoCategory.value, this.photoCaption.value.trim()));
      const current = this.page()!;
      this.page.set({ ...current, photos: [...current.photos, ...stored.filter((s) => s.contentType.startsWith('image/'))] });
    }, `${chosen.length} photo${chosen.length === 1 ? '' : 's'} added.`);
    if (ok) {
      input.value = '';
      this.photoCaption.setValue('');
    }
  }

  protected readonly nextStep = computed(() => {
    const s = this.page()?.visit.status;
    if (s === 'scheduled') return { status: 'on_the_way' as const, label: 'On my way', done: 'On the way' };
    if (s === 'on_the_way') return { status: 'on_site' as const, label: 'Arrived on site', done: 'On site' };
    return null;
  });

  protected async advance(): Promise<void> {
    const p = this.page();
    const step = this.nextStep();
    if (!p || !step) return;
    const ok = await this.run('status', () => firstValueFrom(this.api.setStatus(p.visit.id, step.status)), `Status: ${step.done}.`);
    if (ok) this.page.set({ ...this.page()!, visit: { ...this.page()!.visit, status: step.status, statusLabel: step.done } });
  }

  protected onReadingsSaved(saved: SavedReadings): void {
    const p = this.page();
    if (!p) return;
    this.page.set({ ...p, readings: [...p.readings.filter((r) => r.equipmentId !== saved.equipmentId), saved] });
  }

  private serverErrors(group: FormGroup, fields: Record<string, string>): void {
    for (const [name, message] of Object.entries(fields)) {
      const c = group.get(name);
      if (c) {
        c.setErrors({ server: message });
        c.markAsTouched();
      }
    }
  }

  protected errorOf(group: FormGroup, name: string): string | null {
    const e = group.get(name)?.errors;
    if (!e) return null;
    if (e['server']) return e['server'] as string;
    if (e['maxlength']) return `At most ${(e['maxlength'] as { requiredLength: number }).requiredLength} characters`;
    return null;
  }
}
