import { evaluateReadings, ReadingInputError, type VisitReadings } from '../../../../shared/hvac';
import { evaluateTyped, setPath, toNumber } from './reading-fields';

const isInputError = (e: unknown): e is ReadingInputError => e instanceof ReadingInputError;

describe('readings as typed', () => {
  it('reads a decimal comma and treats empty as not measured', () => {
    expect(toNumber('6,9')).toBe(6.9);
    expect(toNumber('  ')).toBeNull();
    expect(toNumber('7.5.1')).toBe('bad');
  });

  it('sets a bad field aside and still rates the rest', () => {
    const r: Record<string, unknown> = { mode: 'cooling', returnDryBulbF: 75, indoorWetBulbF: 61, supplyDryBulbF: 55, returnRelativeHumidityPct: 140 };
    setPath(r, 'capacitors.compressor.ratedUf', 7.5);
    setPath(r, 'capacitors.compressor.measuredUf', 6.9);
    const result = evaluateTyped(r as VisitReadings, evaluateReadings, isInputError);
    expect(Object.keys(result.errors)).toEqual(['returnRelativeHumidityPct']);
    // 75 °F dry bulb / 61 °F wet bulb return and 55 °F supply: a 20 °F split against the table's 19.9 ± 3 °F target.
    expect(result.checks.find((c) => c.check === 'temperature_split')?.status).toBe('ok');
    // 6.9 µF on a 7.5 µF part is outside ±6 % (common practice).
    expect(result.checks.find((c) => c.check === 'capacitor_compressor')?.status).toBe('alert');
  });

  it('reports the missing half of a pressure and temperature pair without hiding other checks', () => {
    const r = { mode: 'cooling', refrigerant: 'R-410A', suctionPressurePsig: 118, controlVoltageVac: 24 } as VisitReadings;
    const result = evaluateTyped(r, evaluateReadings, isInputError);
    expect(result.errors['suctionLineTempF']).toMatch(/needed/);
    expect(result.checks.map((c) => c.check)).toEqual(['control_voltage']);
  });
});
