import type { PlanView } from '../../../../shared/schemas/plans';

/** What a tier includes, in plain words, for the compare table and the agreement card. */
export function planFeatures(p: PlanView): string[] {
  const visits: string[] = [];
  if (p.coolingVisits) visits.push(`${p.coolingVisits} cooling tune-up${p.coolingVisits > 1 ? 's' : ''}`);
  if (p.heatingVisits) visits.push(`${p.heatingVisits} heating tune-up${p.heatingVisits > 1 ? 's' : ''}`);
  return [
    `${visits.join(' and ') || 'No tune-ups'} a year`,
    `${(p.repairDiscountBps / 100).toLocaleString('en-US', { maximumFractionDigits: 2 })} % off repairs`,
    `Priority service: a visit within ${p.priorityWindowHours} hours`,
    p.diagnosticFeeWaived ? 'No diagnostic fee on service calls' : 'Standard diagnostic fee',
    ...(p.warrantyLaborCovered ? ["Labor included to fit parts under the manufacturer's warranty"] : []),
    ...p.extras,
  ];
}
