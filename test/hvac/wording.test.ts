import { describe, expect, it } from 'vitest';
import { evaluateReadings, homeownerWording, type ReadingCheck } from '../../shared/hvac';

const one = (r: Parameters<typeof evaluateReadings>[0]): ReadingCheck => evaluateReadings(r)[0]!;

describe('homeowner wording', () => {
  it('puts the split in plain words', () => {
    expect(homeownerWording(one({ returnDryBulbF: 75, supplyDryBulbF: 55, indoorWetBulbF: 61 }))).toBe(
      'Cooling check: the air leaving your system is 20 °F cooler than the air going in, in the normal range.',
    );
  });

  it('says when a reading is out of range and what happens next', () => {
    const text = homeownerWording(one({ returnDryBulbF: 75, supplyDryBulbF: 63, indoorWetBulbF: 61 }));
    expect(text).toMatch(/^Cooling check: .* 12 °F cooler/);
    expect(text).toMatch(/outside the normal range; your technician will recommend/);
  });

  it('explains a check waiting on a label detail without alarming', () => {
    const text = homeownerWording(one({ capacitors: { compressor: { measuredUf: 40 } } }));
    expect(text).toMatch(/^Electrical check: .*label/);
    expect(text).not.toMatch(/outside/);
  });

  it('never uses technician shorthand', () => {
    const checks = evaluateReadings({
      returnDryBulbF: 75,
      supplyDryBulbF: 55,
      refrigerant: 'R-410A',
      meteringDevice: 'txv',
      suctionPressurePsig: 130,
      suctionLineTempF: 55,
      controlVoltageVac: 24,
      compressorAmps: 10,
      compressorRatedLoadAmps: 15,
      airflowCfm: 1200,
      nominalTons: 3,
    });
    for (const c of checks) {
      const text = homeownerWording(c);
      expect(text).not.toMatch(/superheat|subcool|RLA|FLA|VAC|CFM|µF|psig/i);
      expect(text.endsWith('.')).toBe(true);
    }
  });
});
