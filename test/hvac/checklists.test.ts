import { describe, expect, it } from 'vitest';
import {
  A2L_REFRIGERANTS,
  EQUIPMENT_KINDS,
  ReadingInputError,
  cautions,
  furnaceHasCasedCoil,
  technicianCautionsFor,
  tuneUpChecklist,
  tuneUpChecklistOn,
  type EquipmentKind,
} from '../../shared/hvac';

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

describe('power off first', () => {
  it('opens every checklist, in both seasons, with power off and locked out or unplugged', () => {
    // Lockout before opening equipment (common practice; OSHA 1910.147 sets the workplace rule).
    for (const kind of EQUIPMENT_KINDS) {
      for (const season of ['cooling', 'heating'] as const) {
        for (const casedCoil of [false, true]) {
          const first = tuneUpChecklist(kind, season, { casedCoil })[0];
          if (!first) continue;
          expect(first.text, `${kind} ${season}`).toMatch(/power|unplug/i);
          expect(first.text, `${kind} ${season}`).toMatch(/off|unplug/i);
        }
      }
    }
    expect(tuneUpChecklist('gas_furnace', 'cooling')[0]!.id).toBe('gf.power_gas_off');
    expect(tuneUpChecklist('gas_furnace', 'cooling')[0]!.text).toMatch(/lock out/);
  });

  it('unplugs a condensate pump before service in both seasons', () => {
    for (const season of ['cooling', 'heating'] as const) {
      expect(tuneUpChecklist('condensate_pump', season)[0]).toMatchObject({ id: 'cp.power_off', text: expect.stringMatching(/Unplug/) });
    }
  });
});

describe('furnace with a cased coil and an outdoor condensing unit', () => {
  it('is recognised from the home’s equipment', () => {
    expect(furnaceHasCasedCoil(['gas_furnace', 'condensing_unit', 'thermostat'])).toBe(true);
    expect(furnaceHasCasedCoil(['gas_furnace', 'heat_pump'])).toBe(true);
    expect(furnaceHasCasedCoil(['gas_furnace', 'thermostat'])).toBe(false);
    expect(furnaceHasCasedCoil(['air_handler', 'condensing_unit'])).toBe(false);
  });

  it('gets coil, drain, overflow and filter items in cooling, citing IMC 307.2.3 for the overflow', () => {
    const { season, items } = tuneUpChecklistOn('gas_furnace', '2026-05-12', { equipmentKinds: ['gas_furnace', 'condensing_unit'] });
    expect(season).toBe('cooling');
    const ids = items.map((i) => i.id);
    expect(ids).toEqual(expect.arrayContaining(['gf.power_gas_off', 'gf.filter', 'gf.coil', 'gf.coil_drain', 'gf.coil_overflow']));
    // IMC 307.2.3: auxiliary drain pan, overflow line or water-level detection for each cooling coil.
    expect(items.find((i) => i.id === 'gf.coil_overflow')!.text).toMatch(/secondary drain.*overflow switch.*IMC 307\.2\.3/);
    // Heating brings the burner items, not the coil ones; a furnace-only home gets no coil items.
    const heating = tuneUpChecklistOn('gas_furnace', '2026-10-12', { equipmentKinds: ['gas_furnace', 'condensing_unit'] }).items.map((i) => i.id);
    expect(heating).toContain('gf.co_test');
    expect(heating).not.toContain('gf.coil');
    expect(tuneUpChecklistOn('gas_furnace', '2026-05-12', { equipmentKinds: ['gas_furnace'] }).items.map((i) => i.id)).not.toContain('gf.coil');
  });
});

describe('ductless systems', () => {
  it('get a drain item and a pump item', () => {
    const ids = tuneUpChecklist('ductless', 'cooling').map((i) => i.id);
    expect(ids).toContain('dl.condensate');
    expect(ids).toContain('dl.condensate_pump');
    expect(tuneUpChecklist('ductless', 'cooling').find((i) => i.id === 'dl.condensate_pump')!.text).toMatch(/unplug/);
  });
});

describe('A2L refrigerants and CO alarms', () => {
  it('cautions on R-32 and R-454B with A2L-rated tools and no ignition sources, citing ASHRAE 34 and UL 60335-2-40', () => {
    const c = cautions.find((x) => x.id === 'a2l_refrigerants')!;
    expect(c.text).toMatch(/R-32 and R-454B/);
    expect(c.text).toMatch(/ASHRAE Standard 34/);
    expect(c.text).toMatch(/UL 60335-2-40/);
    expect(c.text).toMatch(/leak detectors rated for A2L/);
    expect(c.text).toMatch(/ignition sources/);
    expect(A2L_REFRIGERANTS).toEqual(['R-32', 'R-454B']);
    expect(technicianCautionsFor({ fuelBurning: false, hasRefrigerant: true, refrigerants: ['R-454B'] }).map((x) => x.id)).toContain('a2l_refrigerants');
    expect(technicianCautionsFor({ fuelBurning: false, hasRefrigerant: true, refrigerants: ['R-410A'] }).map((x) => x.id)).not.toContain('a2l_refrigerants');
  });

  it('tells homeowners to test CO alarms monthly (U.S. CPSC)', () => {
    const c = cautions.find((x) => x.id === 'co_alarms')!;
    expect(c.text).toMatch(/once a month/);
    expect(c.text).toMatch(/Consumer Product Safety Commission/);
  });
});
