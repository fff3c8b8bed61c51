import { describe, expect, it } from 'vitest';
import { REFRIGERANTS } from '../shared/equipment';
import { equipmentInputSchema, equipmentUpdateSchema, filterSizeSchema } from '../shared/schemas/equipment';

describe('equipment input', () => {
  it('records the compressor type and a variable-speed unit’s maximum frequency', () => {
    const v = equipmentInputSchema.parse({ kind: 'heat_pump', refrigerant: 'R-454B', compressorType: 'variable_speed', maxCompressorHz: '96' });
    expect(v).toMatchObject({ compressorType: 'variable_speed', maxCompressorHz: 96, refrigerant: 'R-454B' });
    const plain = equipmentInputSchema.parse({ kind: 'heat_pump' });
    expect('compressorType' in plain).toBe(false);
    expect(equipmentInputSchema.safeParse({ kind: 'heat_pump', compressorType: 'inverter' }).error?.issues[0]?.path).toEqual(['compressorType']);
    expect(equipmentInputSchema.safeParse({ kind: 'heat_pump', compressorType: 'two_stage', maxCompressorHz: 90 }).error?.issues[0]?.path).toEqual(['maxCompressorHz']);
    expect(equipmentUpdateSchema.parse({ compressorType: '' })).toEqual({ compressorType: null });
    expect(equipmentUpdateSchema.parse({ maxExternalStaticInWc: '0.8' })).toEqual({ maxExternalStaticInWc: 0.8 });
  });

  it('knows R-407C', () => {
    expect(REFRIGERANTS).toContain('R-407C');
    expect(equipmentInputSchema.parse({ kind: 'condensing_unit', refrigerant: 'r407c' }).refrigerant).toBe('R-407C');
  });

  it('accepts a filter size written with its unit', () => {
    expect(filterSizeSchema.parse('16x25x4 in')).toBe('16x25x4');
    expect(filterSizeSchema.parse('16 x 25 x 4 inches')).toBe('16x25x4');
    expect(filterSizeSchema.parse('20X25X4.5"')).toBe('20x25x4.5');
    expect(filterSizeSchema.safeParse('16x25 in').success).toBe(false);
  });
});

describe('equipment update', () => {
  it('changes only the fields sent', () => {
    expect(equipmentUpdateSchema.parse({ notes: 'Replaced the contactor' })).toEqual({ notes: 'Replaced the contactor' });
    expect(equipmentUpdateSchema.parse({ filterSize: '16x25x1' })).toEqual({ filterSize: '16x25x1' });
  });
});

describe('an empty equipment update', () => {
  it('is refused rather than sent to the database with nothing to set', () => {
    const r = equipmentUpdateSchema.safeParse({});
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.message).toBe('Send at least one field to change.');
  });
});
