import { describe, expect, it } from 'vitest';
import {
  demandPrior,
  demandSeries,
  HOURS_PER_WEEK,
  kWhPerLitreAt40,
  learnDemand,
  localHourOfWeek,
  occupantScale,
} from '../../../src/lib/energy/index.js';
import type { EnergyReading } from '../../../src/lib/energy/index.js';
import { TAPPING_QREF_KWH } from '../../../src/lib/thermal/index.js';

const MON = Date.UTC(2025, 0, 6); // a Monday, GMT

describe('demand prior', () => {
  it('is the EN 16147 profile M (Qref 5.845 kWh/day) for two occupants, as litres at 40 °C', () => {
    const prior = demandPrior(2);
    expect(prior).toHaveLength(HOURS_PER_WEEK);
    const day = prior.slice(0, 24).reduce((a, b) => a + b, 0);
    expect(day * kWhPerLitreAt40(10)).toBeCloseTo(TAPPING_QREF_KWH.M, 9);
    // Profile M draws a 1.4 kWh shower at 07:05 and 21:30 (814/2013 Annex III, from memory): busiest hours.
    expect(prior[7]).toBeGreaterThan(prior[12]!);
    expect(prior[3]).toBe(0);
    expect(prior.slice(24, 48)).toEqual(prior.slice(0, 24));
  });

  it('scales with occupants by the SAP 2012 Appendix J rule 25·N + 36 L/day (from memory)', () => {
    expect(occupantScale(2)).toBe(1);
    expect(occupantScale(4)).toBeCloseTo(136 / 86, 12);
    expect(demandPrior(4)[7]! / demandPrior(2)[7]!).toBeCloseTo(136 / 86, 12);
  });
});

describe('learnDemand', () => {
  // A home that runs a 10 L/min draw of 60 °C water for 6 minutes every day at 18:00, with readings every minute.
  function history(weeks: number): EnergyReading[] {
    const out: EnergyReading[] = [];
    for (let m = 0; m < weeks * 7 * 1440; m++) {
      const minuteOfDay = m % 1440;
      out.push({
        ts: MON + m * 60_000,
        layersC: [20, 60],
        drawLpm: minuteOfDay >= 1080 && minuteOfDay < 1086 ? 10 : 0,
      });
    }
    return out;
  }

  it('gives the prior to a new home', () => {
    const model = learnDemand([], { occupants: 3 });
    expect(model.litres40ByHour).toEqual(demandPrior(3));
  });

  it('blends prior and history by weeks observed: (w·prior + Σ observed)/(w + weeks)', () => {
    const model = learnDemand(history(2), { occupants: 2, priorWeeks: 2, timeZone: 'UTC' });
    // 60 L of 60 °C water a day: heat above 10 °C in litres at 40 °C is 60 × ρ(60)c(35)·50 / (ρ(45)c(45)·30),
    // about 60 × 50/30 = 100 L (the property ratio is within 1 %).
    const observedPerDay = model.litres40ByHour[18]! * 2 - demandPrior(2)[18]!; // solve the blend for Σ/weeks
    expect(observedPerDay).toBeGreaterThan(99);
    expect(observedPerDay).toBeLessThan(101);
    // Two weeks observed in every hour (the last reading closes nothing, so one minute short in one hour).
    expect(model.weeksObserved[18]).toBeCloseTo(2, 9);
    // An hour with no draws moves halfway from the prior towards zero.
    expect(model.litres40ByHour[7]).toBeCloseTo(demandPrior(2)[7]! / 2, 6);
  });

  it('spreads each hour over its half-hour steps for the planner', () => {
    const model = learnDemand([], { occupants: 2, timeZone: 'UTC' });
    const s = demandSeries(model, MON + 7 * 3_600_000, 4);
    expect(s[0]).toBeCloseTo(model.litres40ByHour[7]! / 2, 12);
    expect(s[1]).toBe(s[0]);
    expect(s[2]).toBeCloseTo(model.litres40ByHour[8]! / 2, 12);
  });

  it('counts hours of the week on the local clock (Monday 00:00 = 0; British Summer Time is UTC+1)', () => {
    expect(localHourOfWeek(MON, 'Europe/London')).toBe(0);
    expect(localHourOfWeek(Date.UTC(2025, 6, 6, 23, 30), 'Europe/London')).toBe(0); // Sun 23:30 UTC = Mon 00:30 BST
    expect(localHourOfWeek(MON - 1, 'UTC')).toBe(167);
  });
});
