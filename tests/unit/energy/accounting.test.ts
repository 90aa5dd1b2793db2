import { describe, expect, it } from 'vitest';
import { accountDay, EnergyInputError, parseHalfHourlyCsv, rollUpMonths } from '../../../src/lib/energy/index.js';
import type { EnergyReading, HalfHourlyTariff } from '../../../src/lib/energy/index.js';
import { createTank, sensorReadings, stepTankInPlace, tankNodeCount } from '../../../src/lib/thermal/index.js';
import type { TankSpec } from '../../../src/lib/thermal/index.js';

const T0 = Date.UTC(2025, 0, 6);
const MIN = 60_000;

function halfHourly(prices: [number, number][]): HalfHourlyTariff {
  const lines = prices.map(
    ([imp, exp], i) =>
      `${new Date(T0 + i * 30 * MIN).toISOString()},${new Date(T0 + (i + 1) * 30 * MIN).toISOString()},${imp},${exp},p/kWh`,
  );
  const r = parseHalfHourlyCsv(['start,end,import,export,unit', ...lines].join('\n'));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.tariff;
}

describe('accountDay: a hand-worked example', () => {
  // 200 L tank, two layers of 100 L held at 40 and 60 °C all along (so ΔE = 0), UA 2 W/K, room 20 °C,
  // cold water 10 °C. Readings every 30 minutes; each holds until the next.
  //   A 00:00–00:30 compressor on, powerW 1200, drawing 2 L/min
  //   B 00:30–01:00 immersion 3000 W, of which 1000 W is solar surplus
  //   C 01:00–01:30 compressor on, powerW 1500
  //   D 01:30–02:00 idle
  // Prices (import, export) p/kWh: 10/5, 20/5, 30/5, 40/5.
  const layersC = [40, 60];
  const at = (m: number, r: Partial<EnergyReading>): EnergyReading => ({ ts: T0 + m * MIN, layersC, ...r });
  const readings = [
    at(0, { compressor: true, powerW: 1200, drawLpm: 2 }),
    at(30, { immersionW: 3000, powerW: 3000, solarSurplusW: 1000 }),
    at(60, { compressor: true, powerW: 1500 }),
    at(90, {}),
    at(120, {}),
  ];
  const day = accountDay(
    readings,
    { volumeL: 200, uaWPerK: 2, ambientC: 20 },
    halfHourly([
      [10, 5],
      [20, 5],
      [30, 5],
      [40, 5],
    ]),
    {
      startMs: T0,
      endMs: T0 + 120 * MIN,
      date: '2025-01-06',
      maxGapMs: 30 * MIN,
      hpTailMs: 0,
    },
  );

  // Standing loss: mean layer 50 °C, UA·ΔT = 2 W/K × 30 K = 60 W; × 0.5 h = 0.030 kWh per interval, 4 intervals.
  const lossKWh = 4 * 0.03;
  // Draw in A: 2 L/min × 30 min = 60 L of top water at 60 °C, heat above 10 °C:
  // 0.060 m³ × 983.2 kg/m³ (density at 60 °C, IAPWS-IF97) × 4178 J/(kg·K) (cp at 35 °C, IAPWS-IF97) × 50 K
  // = 12 323 429 J = 3.4232 kWh.
  const drawnKWh = (0.06 * 983.2 * 4178 * 50) / 3.6e6;

  it('closes the heat balance of the heat-pump intervals: ΔE + drawn + loss', () => {
    expect(day.drawnKWh).toBeCloseTo(drawnKWh, 2);
    expect(day.standingLossKWh).toBeCloseTo(lossKWh, 10);
    // A: 0 + 3.4232 + 0.03; C: 0 + 0 + 0.03 → 3.4832 kWh.
    expect(day.heatPumpHeatKWh).toBeCloseTo(drawnKWh + 0.06, 2);
    expect(day.storedChangeKWh).toBe(0);
  });

  it('splits the immersion between solar surplus and grid (an element turns all its electricity into heat; common practice)', () => {
    // B: 3000 W × 0.5 h = 1.5 kWh, of which 1000 W × 0.5 h = 0.5 kWh solar, 1.0 kWh grid.
    expect(day.immersionSolarHeatKWh).toBeCloseTo(0.5, 10);
    expect(day.immersionGridHeatKWh).toBeCloseTo(1.0, 10);
    expect(day.immersionGridElectricityKWh).toBeCloseTo(1.0, 10);
    expect(day.heatInKWh).toBeCloseTo(drawnKWh + 0.06 + 1.5, 2);
    // Nothing but the immersion ran in B and nothing at all in D: B leaves 0.03 − 1.5, D leaves 0.03.
    expect(day.residualKWh).toBeCloseTo(-1.44, 10);
  });

  it('prices each half hour at the tariff in force then', () => {
    // Heat pump: A 1.2 kW × 0.5 h = 0.6 kWh at 10 p = 6 p; C 1.5 kW × 0.5 h = 0.75 kWh at 30 p = 22.5 p.
    expect(day.heatPumpElectricityKWh).toBeCloseTo(1.35, 10);
    expect(day.heatPumpCostPence).toBeCloseTo(28.5, 10);
    // Immersion from grid: 1.0 kWh at 20 p = 20 p. Solar: 0.5 kWh would have earned 0.5 × 5 = 2.5 p exported.
    expect(day.immersionCostPence).toBeCloseTo(20, 10);
    expect(day.costPence).toBeCloseTo(48.5, 10);
    expect(day.solarExportForgonePence).toBeCloseTo(2.5, 10);
    expect(day.unpricedKWh).toBe(0);
  });

  it('gives the DHW COP as heat-pump heat over its electricity (EN 16147 definition of COP_DHW)', () => {
    expect(day.dhwCop).toBeCloseTo((drawnKWh + 0.06) / 1.35, 2);
    expect(day.coveredMinutes).toBe(120);
  });
});

describe('accountDay against the tank model', () => {
  const spec: TankSpec = {
    volumeL: 210,
    sensorCount: 12,
    heightM: 1.5,
    ambientC: 18,
    uaWPerK: 1.5,
    heatSource: 'hp_plate',
    hpOutputW: 5000,
    immersionW: 3000,
    immersionHeightFrac: 0.6,
  };
  // Sensors = nodes, so the readings are the model's own temperatures.
  it("recovers the model's heat-pump heat, draw and loss within 3 % from one-minute readings", () => {
    expect(tankNodeCount(spec)).toBe(12);
    const COP = 3;
    const state = createTank(spec, 45);
    const readings: EnergyReading[] = [];
    let hp = 0,
      imm = 0,
      drawn = 0,
      loss = 0,
      on = false;
    for (let m = 0; m <= 1440; m++) {
      const layersC = sensorReadings(spec, state);
      const mid = layersC[4]!;
      if (mid < 45) on = true;
      else if (mid >= 52) on = false;
      const drawLpm = (m >= 420 && m < 430) || (m >= 1260 && m < 1268) ? 8 : 0;
      const immersionOn = m >= 720 && m < 760;
      if (m === 1440) {
        readings.push({ ts: T0 + m * MIN, layersC });
        break;
      }
      const r = stepTankInPlace(spec, state, { dtS: 60, coldC: 10, drawLpm, hpOn: on, immersionOn });
      hp += r.hpHeatJ / 3.6e6;
      imm += r.immersionHeatJ / 3.6e6;
      drawn += r.drawnJ / 3.6e6;
      loss += r.lossJ / 3.6e6;
      const immersionW = r.immersionHeatJ / 60;
      readings.push({
        ts: T0 + m * MIN,
        layersC,
        compressor: on,
        immersionW,
        powerW: r.hpHeatJ / 60 / COP + immersionW,
        drawLpm,
        solarSurplusW: immersionOn ? 1000 : 0,
      });
    }
    const flat = halfHourly(Array.from({ length: 48 }, () => [20, 5] as [number, number]));
    const day = accountDay(readings, spec, flat, { startMs: T0, endMs: T0 + 1440 * MIN, date: '2025-01-06' });
    expect(hp).toBeGreaterThan(1);
    expect(day.heatPumpHeatKWh).toBeGreaterThan(hp * 0.97);
    expect(day.heatPumpHeatKWh).toBeLessThan(hp * 1.03);
    expect(day.drawnKWh / drawn).toBeGreaterThan(0.97);
    expect(day.drawnKWh / drawn).toBeLessThan(1.03);
    expect(day.standingLossKWh / loss).toBeGreaterThan(0.97);
    expect(day.standingLossKWh / loss).toBeLessThan(1.03);
    expect(day.immersionGridHeatKWh + day.immersionSolarHeatKWh).toBeCloseTo(imm, 6);
    expect(day.dhwCop!).toBeGreaterThan(COP * 0.97);
    expect(day.dhwCop!).toBeLessThan(COP * 1.03);
    expect(Math.abs(day.residualKWh)).toBeLessThan(0.05 * (hp + imm));
    // Cost: all grid electricity at the flat 20 p.
    expect(day.costPence).toBeCloseTo(20 * (day.heatPumpElectricityKWh + day.immersionGridElectricityKWh), 8);
  });
});

describe('accountDay edges', () => {
  const tank = { volumeL: 200, uaWPerK: 2, ambientC: 20 };
  const flat = halfHourly([
    [10, 0],
    [10, 0],
    [10, 0],
    [10, 0],
  ]);
  const opts = { startMs: T0, endMs: T0 + 120 * MIN, date: '2025-01-06' };

  it('does not integrate across a gap in the readings, and reports it', () => {
    const readings: EnergyReading[] = [
      { ts: T0, layersC: [50, 50], compressor: true, powerW: 1000 },
      { ts: T0 + 60 * MIN, layersC: [50, 50] },
      { ts: T0 + 61 * MIN, layersC: [50, 50] },
    ];
    const day = accountDay(readings, tank, flat, opts);
    expect(day.gapMinutes).toBe(60);
    expect(day.coveredMinutes).toBe(1);
    expect(day.heatPumpElectricityKWh).toBe(0);
  });

  it('leaves electricity at an unpriced time out of the cost and says how much', () => {
    const readings: EnergyReading[] = [
      { ts: T0 + 119 * MIN, layersC: [50, 50], compressor: true, powerW: 1200 },
      { ts: T0 + 121 * MIN, layersC: [50, 50] },
    ];
    const day = accountDay(readings, tank, flat, { ...opts, endMs: T0 + 180 * MIN });
    // 1.2 kW for 1 minute in the last priced slot (0.02 kWh at 10 p) and 1 minute after it.
    expect(day.heatPumpCostPence).toBeCloseTo(0.2, 10);
    expect(day.unpricedKWh).toBeCloseTo(0.02, 10);
  });

  it('refuses unsorted readings and a mismatched layer count, naming the reading', () => {
    const a = { ts: T0 + MIN, layersC: [50, 50] };
    expect(() => accountDay([a, { ...a }], tank, flat, opts)).toThrowError(EnergyInputError);
    try {
      accountDay([a, { ts: T0 + 2 * MIN, layersC: [50] }], tank, flat, opts);
    } catch (e) {
      expect((e as EnergyInputError).field).toBe('readings[1].layersC');
    }
    expect(() =>
      accountDay([a, { ts: T0 + 2 * MIN, layersC: [50, 50], drawLpm: Number.NaN }], tank, flat, opts),
    ).toThrowError(/readings\[1\]\.drawLpm/);
  });
});

describe('rollUpMonths', () => {
  it('sums days into months and recomputes the COP from the sums, not as a mean of daily COPs', () => {
    const tank = { volumeL: 200, uaWPerK: 0, ambientC: 20 };
    const flat = halfHourly(Array.from({ length: 4 }, () => [10, 0] as [number, number]));
    const mk = (date: string, powerW: number, drawLpm: number) =>
      accountDay(
        [
          { ts: T0, layersC: [60, 60], compressor: true, powerW, drawLpm },
          { ts: T0 + 30 * MIN, layersC: [60, 60] },
        ],
        tank,
        flat,
        { startMs: T0, endMs: T0 + 120 * MIN, date, maxGapMs: 30 * MIN },
      );
    const d1 = mk('2025-01-30', 1000, 1),
      d2 = mk('2025-01-31', 2000, 1),
      d3 = mk('2025-02-01', 1000, 2);
    const [jan, feb] = rollUpMonths([d3, d1, d2]);
    expect(jan!.month).toBe('2025-01');
    expect(jan!.days).toBe(2);
    expect(jan!.heatPumpElectricityKWh).toBeCloseTo(1.5, 10);
    expect(jan!.costPence).toBeCloseTo(d1.costPence + d2.costPence, 10);
    expect(jan!.dhwCop).toBeCloseTo((d1.heatPumpHeatKWh + d2.heatPumpHeatKWh) / 1.5, 10);
    expect(feb!.days).toBe(1);
  });
});
