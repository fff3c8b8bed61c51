import { describe, expect, it } from 'vitest';
import { completionProblems, unfinishedItems } from '../shared/visit-completion';

describe('closing a visit', () => {
  const sections = [
    {
      equipmentLabel: 'Outdoor unit',
      items: [
        { text: 'Clean the condenser coil', result: 'done' },
        { text: 'Check the contactor', result: null },
      ],
    },
    { equipmentLabel: 'Furnace', items: [{ text: 'Check the flame sensor', result: null }] },
  ];

  it('lists the checklist items with no result, named by their system', () => {
    expect(unfinishedItems(sections)).toEqual(['Outdoor unit: Check the contactor', 'Furnace: Check the flame sensor']);
  });

  it('asks why open items were skipped, and for a signature when a repair was done', () => {
    const open = unfinishedItems(sections);
    expect(completionProblems(open, { skippedReason: ' ', repairDone: false })).toEqual({ skippedReason: expect.stringContaining('these 2 checklist items were skipped') });
    expect(completionProblems(open, { skippedReason: 'No attic access', repairDone: true })).toEqual({ signature: expect.stringMatching(/homeowner signs/) });
    expect(completionProblems(open, { skippedReason: 'No attic access', repairDone: true, signature: { image: 'data:image/png;base64,AA==', signedBy: 'Dana' } })).toEqual({});
    expect(completionProblems([], { skippedReason: '', repairDone: false })).toEqual({});
  });
});
