import { describe, expect, it } from 'vitest';
import { standingLoss, ThermalInputError, waterCp, waterDensity } from '../../../src/lib/thermal/index.js';

const _HOUR = 3_600_000;
const T0 = Date.UTC(2025, 0, 10, 22);

/** Readings every 15 min following Newton's law of cooling for the given UA (W/K). */
function coolingCurve(ua: number, hours: number, noise: (i: number) => number = () => 0) {
  // Newton's law of cooling: T(t) = T_amb + (T0 − T_amb)·e^(−t·UA/(m·c)).
  const mc = 0.2 * waterDensity(52) * waterCp(52);
  const out = [];
  for (let i = 0; i <= hours * 4; i++) {
    const t = i * 900;
    out.push({ t: T0 + t * 1000, meanC: 18 + (58 - 18) * Math.exp((-t * ua) / mc) + noise(i) });
  }
  return out;
}

describe('standingLoss', () => {
  it('recovers UA from a clean cooling curve', () => {
    const r = standingLoss(coolingCurve(1.8, 10), { volumeL: 200, ambientC: 18 });
    expect(r.uaWPerK).toBeCloseTo(1.8, 2);
    expect(r.lossWAt45K).toBeCloseTo(1.8 * 45, 0);
    expect(r.kWhPer24hAt45K).toBeCloseTo((1.8 * 45 * 24) / 1000, 2);
    expect(r.rmsResidualK).toBeLessThan(0.01);
  });

  it('tolerates sensor noise of a tenth of a kelvin', () => {
    const noisy = coolingCurve(1.8, 12, (i) => (i % 2 === 0 ? 0.1 : -0.1));
    expect(standingLoss(noisy, { volumeL: 200, ambientC: 18 }).uaWPerK).toBeCloseTo(1.8, 1);
  });

  it('rejects a period that is too short, too noisy, heated or unordered', () => {
    expect(() => standingLoss(coolingCurve(1.8, 2), { volumeL: 200, ambientC: 18 })).toThrow(
      /span 2.00 h: a cooling period of at least 4 h/,
    );
    const jumpy = coolingCurve(1.8, 10, (i) => (i === 20 ? -3 : 0));
    expect(() => standingLoss(jumpy, { volumeL: 200, ambientC: 18 })).toThrow(/too noisy/);
    const heated = coolingCurve(1.8, 10).map((s, i) => ({ ...s, meanC: 40 + i * 0.2 }));
    expect(() => standingLoss(heated, { volumeL: 200, ambientC: 18 })).toThrow(/do not cool/);
    const swapped = coolingCurve(1.8, 10);
    [swapped[3], swapped[4]] = [swapped[4]!, swapped[3]!];
    expect(() => standingLoss(swapped, { volumeL: 200, ambientC: 18 })).toThrow(
      /samples\[4\].t is not after samples\[3\].t/,
    );
    expect(() => standingLoss(coolingCurve(1.8, 10), { volumeL: 200, ambientC: 57 })).toThrow(ThermalInputError);
    expect(() => standingLoss([], { volumeL: 200, ambientC: 18 })).toThrow(/at least 3 readings/);
  });
});
