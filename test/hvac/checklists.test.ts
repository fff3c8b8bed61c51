import { describe, expect, it } from 'vitest';
import { EQUIPMENT_KINDS, ReadingInputError, cautions, tuneUpChecklist, type EquipmentKind } from '../../shared/hvac';

describe('tune-up checklists', () => {
  it('has items for every kind of equipment in its main season', () => {
    for (const kind of EQUIPMENT_KINDS) {
      const all = [...tuneUpChecklist(kind, 'cooling'), ...tuneUpChecklist(kind, 'heating')];
      expect(all.length).toBeGreaterThan(2);
    }
  });

  it('keeps ids unique and stable', () => {
    for (const kind of EQUIPMENT_KINDS) {
      const items = [...new Map([...tuneUpChecklist(kind, 'cooling'), ...tuneUpChecklist(kind, 'heating')].map((i) => [i.id, i])).values()];
      for (const i of items) expect(i.id).toMatch(/^[a-z]{2}\.[a-z0-9_]+$/);
    }
    const perKind = EQUIPMENT_KINDS.map((k) => new Set([...tuneUpChecklist(k, 'cooling'), ...tuneUpChecklist(k, 'heating')].map((i) => i.id)));
    const total = perKind.reduce((n, s) => n + s.size, 0);
    expect(new Set(perKind.flatMap((s) => [...s])).size).toBe(total);
    // Saved visits refer to these ids.
    expect(tuneUpChecklist('gas_furnace', 'heating').map((i) => i.id)).toContain('gf.co_test');
    expect(tuneUpChecklist('air_handler', 'cooling').map((i) => i.id)).toContain('ah.condensate_switch');
  });

  it('splits work by season', () => {
    // Defrost is a heating-season check; coil cleaning before cooling (common practice).
    expect(tuneUpChecklist('heat_pump', 'heating').map((i) => i.id)).toContain('hp.defrost');
    expect(tuneUpChecklist('heat_pump', 'cooling').map((i) => i.id)).not.toContain('hp.defrost');
    expect(tuneUpChecklist('condensing_unit', 'cooling').map((i) => i.id)).toContain('cu.coil_clean');
  });

  it('rejects an unknown kind or season by name', () => {
    const f = (fn: () => unknown) => {
      try {
        fn();
      } catch (e) {
        return (e as ReadingInputError).field;
      }
      return null;
    };
    expect(f(() => tuneUpChecklist('boiler' as EquipmentKind, 'heating'))).toBe('kind');
    expect(f(() => tuneUpChecklist('thermostat', 'spring' as 'cooling'))).toBe('season');
  });
});

describe('cautions', () => {
  it('cover refrigerant certification, capacitors and carbon monoxide', () => {
    const text = cautions.map((c) => c.text).join(' ');
    expect(text).toMatch(/EPA Section 608/); // US Clean Air Act section 608 technician certification
    expect(text).toMatch(/discharge/i);
    expect(text).toMatch(/carbon monoxide/i);
  });

  it('each defers to local codes or licensed practice', () => {
    for (const c of cautions) expect(c.text).toMatch(/local|licensed/i);
    expect(new Set(cautions.map((c) => c.id)).size).toBe(cautions.length);
  });
});
