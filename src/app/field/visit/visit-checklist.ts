import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import { CHECKLIST_RESULT_LABELS, CHECKLIST_RESULTS } from '../../../../shared/checklist';
import type { ChecklistResult, ChecklistSection, FieldVisit } from '../../../../shared/schemas/field';
import { FieldApi } from '../field-api';
import { VisitDrafts } from '../visit-drafts';
import { CautionNote } from './caution-note';
import { VisitSaves } from './visit-save';

/** The season's tune-up checklist, one section per system; every tap is kept on the phone until saved. */
@Component({
  selector: 'sw-visit-checklist',
  imports: [MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatIconModule, MatInputModule, CautionNote],
  templateUrl: './visit-checklist.html',
  styleUrl: './visit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitChecklist {
  private readonly api = inject(FieldApi);
  private readonly drafts = inject(VisitDrafts);

  /** The visit as last loaded from the server (for the season it was asked in). */
  readonly visit = input.required<FieldVisit>();
  readonly locked = input(false);
  readonly seasonChange = output<'cooling' | 'heating'>();
  /** The checklist as the server holds it after each save. */
  readonly saved = output<ChecklistSection[]>();

  protected readonly results = CHECKLIST_RESULTS;
  protected readonly resultLabels = CHECKLIST_RESULT_LABELS;
  protected readonly saves = new VisitSaves(this.drafts);
  protected readonly season = computed(() => this.visit().season);
  /** Each load starts from this phone's draft for the season, else from the server's answers. */
  protected readonly checklist = linkedSignal(() => {
    const p = this.visit();
    return this.drafts.read<ChecklistSection[]>(p.visit.id, `checklist.${p.season}`) ?? p.checklist;
  });
  protected readonly fuelCaution = computed(() => {
    const p = this.visit();
    return p.equipment.some((e) => e.kind === 'gas_furnace') ? p.cautions.find((c) => c.id === 'fuel_burning_equipment') : undefined;
  });

  protected switchSeason(season: 'cooling' | 'heating'): void {
    if (season !== this.season()) this.seasonChange.emit(season);
  }

  private keep(next: ChecklistSection[]): void {
    this.checklist.set(next);
    this.drafts.write(this.visit().visit.id, `checklist.${this.season()}`, next);
  }

  protected setResult(section: ChecklistSection, itemId: string, result: ChecklistResult): void {
    if (this.locked()) return;
    this.keep(
      this.checklist().map((s) =>
        s.equipmentId !== section.equipmentId ? s : { ...s, items: s.items.map((i) => (i.id === itemId ? { ...i, result: i.result === result ? null : result } : i)) },
      ),
    );
  }

  protected setNote(section: ChecklistSection, itemId: string, note: string): void {
    this.keep(this.checklist().map((s) => (s.equipmentId !== section.equipmentId ? s : { ...s, items: s.items.map((i) => (i.id === itemId ? { ...i, note } : i)) })));
  }

  protected doneCount(section: ChecklistSection): number {
    return section.items.filter((i) => i.result !== null).length;
  }

  protected save(): void {
    const id = this.visit().visit.id;
    const season = this.season();
    const items = this.checklist().flatMap((s) =>
      s.items.filter((i) => i.result !== null).map((i) => ({ equipmentId: s.equipmentId, itemId: i.id, result: i.result!, note: i.note })),
    );
    void this.saves.run(
      id,
      `checklist.${season}`,
      async () => {
        const res = await firstValueFrom(this.api.saveChecklist(id, { season, items }));
        this.checklist.set(res.checklist);
        this.saved.emit(res.checklist);
      },
      'Checklist saved.',
    );
  }
}
