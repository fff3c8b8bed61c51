import { TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { CompletionAnswers } from '../../../../shared/visit-completion';
import { CompleteVisitDialog } from './complete-visit-dialog';

describe('CompleteVisitDialog', () => {
  async function open(unfinished: string[]) {
    let closed: CompletionAnswers | undefined;
    TestBed.configureTestingModule({
      imports: [CompleteVisitDialog],
      providers: [
        { provide: MAT_DIALOG_DATA, useValue: { unfinished, householdName: 'Whitfield household' } },
        { provide: MatDialogRef, useValue: { close: (v: CompletionAnswers) => (closed = v) } },
      ],
    });
    const fixture = TestBed.createComponent(CompleteVisitDialog);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    const confirm = () => [...el.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.trim() === 'Complete visit')!;
    return { fixture, el, confirm, closed: () => closed };
  }

  it('lists the unticked checklist items and will not close the visit until it is told why they were skipped', async () => {
    const { fixture, el, confirm, closed } = await open(['Outdoor unit: Clean the condenser coil', 'Furnace: Check the flame sensor']);
    expect([...el.querySelectorAll('.unfinished li')].map((li) => li.textContent)).toEqual(['Outdoor unit: Clean the condenser coil', 'Furnace: Check the flame sensor']);
    expect(confirm().disabled).toBe(true);
    expect(el.textContent).toContain('Say why the unticked items were skipped.');
    const reason = el.querySelector('textarea')!;
    reason.value = 'No attic access today.';
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(confirm().disabled).toBe(false);
    confirm().click();
    expect(closed()).toEqual({ skippedReason: 'No attic access today.', repairDone: false });
  });

  it("asks for the homeowner's signature when a repair was done, and returns it with the signer", async () => {
    const { fixture, el, confirm, closed } = await open([]);
    el.querySelector<HTMLInputElement>('mat-checkbox input')!.click();
    await fixture.whenStable();
    expect(el.querySelector('canvas')).not.toBeNull();
    expect(el.textContent).toContain('Ask the homeowner to sign for the repair.');
    expect(confirm().disabled).toBe(true);
    // jsdom draws nothing on a canvas: hand the component the image a stroke would give.
    (fixture.componentInstance as unknown as { signatureDrawn(i: string): void }).signatureDrawn('data:image/png;base64,iVBORw0KGgo=');
    await fixture.whenStable();
    expect(confirm().disabled).toBe(false);
    confirm().click();
    expect(closed()).toEqual({ skippedReason: '', repairDone: true, signature: { image: 'data:image/png;base64,iVBORw0KGgo=', signedBy: 'Whitfield' } });
  });
});
