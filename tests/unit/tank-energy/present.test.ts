import { describe, expect, it } from 'vitest';
import { fmtMoney, solarSentence } from '../../../src/lib/tank-energy/present';

describe('solarSentence', () => {
  it('says the free solar heat as litres of warm water', () => {
    // One litre at 40 °C from 10 °C mains, with the tank model's water at 45 °C (IAPWS-IF97: 990.2 kg/m³,
    // 4.180 kJ/(kg·K)): 0.9902 kg × 4.180 kJ/(kg·K) × 30 K = 124.2 kJ = 0.0345 kWh; 1.2 kWh ÷ 0.0345 = 34.8 → 35 litres.
    expect(solarSentence(1.2, 7)).toBe(
      'Your solar panels heated about 35 litres of it for free over the last 7 days, with spare power that would otherwise have gone to the grid.',
    );
    expect(solarSentence(0.05, 1)).toMatch(/about 1 litre of it for free over the last day/);
  });

  it('says nothing when there was no free heat worth mentioning', () => {
    expect(solarSentence(0, 7)).toBeNull();
    expect(solarSentence(0.01, 7)).toBeNull();
    expect(solarSentence(Number.NaN, 7)).toBeNull();
  });
});

describe('fmtMoney', () => {
  it('writes pence under a pound and pounds from one', () => {
    expect(fmtMoney(45.4)).toBe('45p');
    expect(fmtMoney(320)).toBe('£3.20');
  });
});
