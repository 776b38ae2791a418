import { leadVerdict } from './diagnosis-section';

// Resistances: NEC Chapter 9 Table 8 (stranded copper, 75 °C): AWG 18 7.95 Ω/kft, AWG 10 1.24 Ω/kft,
// brought to 20 °C with α20 = 0.00393 /K (as api/src/domain/dc-lead.ts does). Band: 13.8 V ± 15 %
// (11.73-15.87 V), common practice, no published standard. Worked by hand.
describe('the DC lead verdict beside the diagnosis', () => {
  const base = { gauge: 'awg:18', sourceV: '13.8', idleCurrentA: '', transmitCurrentA: '20', lengthM: '3' };

  it('3 m of AWG 18 at 20 A drops about 2.57 V: the lead explains a low-voltage fault', () => {
    // 7.95 / 304.8 / 1.21615 = 0.021447 Ω/m; × 2 × 3 m = 0.12868 Ω; × 20 A = 2.574 V; 13.8 − 2.574 = 11.226 V < 11.73 V.
    const v = leadVerdict(base)!;
    expect(v.drop.dropV).toBeCloseTo(2.574, 2);
    expect(v.drop.voltageAtRadioV).toBeCloseTo(11.226, 2);
    expect(v.explainsLowVoltage).toBe(true);
  });

  it('1 m of AWG 10 at 20 A drops about 0.13 V: the lead does not explain it', () => {
    // 1.24 / 304.8 / 1.21615 = 0.0033452 Ω/m; × 2 × 1 m × 20 A = 0.1338 V.
    const v = leadVerdict({ ...base, gauge: 'awg:10', lengthM: '1' })!;
    expect(v.drop.dropV).toBeCloseTo(0.1338, 3);
    expect(v.explainsLowVoltage).toBe(false);
  });

  it('a supply already outside the band is not blamed on the lead; missing or bad fields give no verdict', () => {
    expect(leadVerdict({ ...base, sourceV: '11.0' })!.explainsLowVoltage).toBe(false);
    expect(leadVerdict({ ...base, transmitCurrentA: '', idleCurrentA: '1.5' })!.currentA).toBe(1.5);
    expect(leadVerdict({ ...base, lengthM: '' })).toBeNull();
    expect(leadVerdict({ ...base, gauge: 'awg:7' })).toBeNull();
    expect(leadVerdict({ ...base, transmitCurrentA: 'lots' })).toBeNull();
  });
});
