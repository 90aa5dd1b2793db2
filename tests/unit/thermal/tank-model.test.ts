import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  createTank,
  sensorReadings,
  stepTank,
  stepTankInPlace,
  storedEnergyKWh,
  tankEnergyJ,
  tankNodeCount,
  tappingProfile,
  ThermalInputError,
} from '../../../src/lib/thermal/index.js';
import type { StepInputs, TankSpec, TankState } from '../../../src/lib/thermal/index.js';

const base: TankSpec = {
  volumeL: 210,
  sensorCount: 12,
  heightM: 1.5,
  ambientC: 18,
  uaWPerK: 1.5,
  heatSource: 'hp_plate',
  hpOutputW: 6000,
  immersionW: 3000,
  immersionHeightFrac: 0.6,
};
const idle: StepInputs = { dtS: 60, coldC: 10, drawLpm: 0, hpOn: false, immersionOn: false };

function isStable(t: readonly number[]): boolean {
  for (let i = 0; i < t.length - 1; i++) if (t[i]! > t[i + 1]! + 1e-9) return false;
  return true;
}

/**
 * One simulated day of the EN 16147 / 814/2013 M tapping cycle: each draw runs at its minimum flow
 * until the energy drawn (above cold) reaches the draw's energy. The heat pump reheats whenever the
 * sensor at one third of the height falls below 45 °C. Returns the balance terms and energies.
 */
function simulateDay(spec: TankSpec, state: TankState, dtS: number) {
  const draws = tappingProfile('M').draws;
  let heatIn = 0,
    drawn = 0,
    loss = 0,
    hpOn = false,
    d = 0,
    owedJ = 0;
  for (let t = 0; t < 86400; t += dtS) {
    const minute = t / 60;
    while (d < draws.length && draws[d]!.minuteOfDay <= minute) owedJ += draws[d++]!.energyKWh * 3.6e6;
    const s = sensorReadings(spec, state);
    const mid = s[Math.floor(s.length / 3)]!;
    if (mid < 45) hpOn = true;
    if (s[s.length - 1]! >= 54) hpOn = false;
    const r = stepTankInPlace(spec, state, { dtS, coldC: 10, drawLpm: owedJ > 0 ? 6 : 0, hpOn, immersionOn: false });
    owedJ = Math.max(0, owedJ - r.drawnJ);
    heatIn += r.heatInJ;
    drawn += r.drawnJ;
    loss += r.lossJ;
  }
  return { heatIn, drawn, loss };
}

describe('tank model: energy balance', () => {
  it('conserves energy over a simulated day of the M tapping cycle', () => {
    // Tapping cycle M: Regulation (EU) No 814/2013 Annex III; balance ΔE = in − drawn − loss is the first law.
    const state = createTank(base, 50);
    const e0 = tankEnergyJ(base, state);
    const r = simulateDay(base, state, 60);
    const e1 = tankEnergyJ(base, state);
    expect(r.drawn / 3.6e6).toBeGreaterThan(5.8); // the day's draws were served (Qref M 5.845 kWh)
    expect(Math.abs(e1 - e0 - (r.heatIn - r.drawn - r.loss))).toBeLessThan(1e-6 * (r.heatIn + r.drawn));
  });

  it('conserves energy for any tank, source and schedule (property)', () => {
    const specArb = fc.record({
      volumeL: fc.double({ min: 80, max: 400, noNaN: true }),
      sensorCount: fc.integer({ min: 1, max: 16 }),
      heightM: fc.double({ min: 0.6, max: 2.2, noNaN: true }),
      ambientC: fc.double({ min: 0, max: 30, noNaN: true }),
      uaWPerK: fc.double({ min: 0, max: 5, noNaN: true }),
      heatSource: fc.constantFrom(
        'hp_plate' as const,
        'hp_coil' as const,
        'immersion_only' as const,
        'boiler_coil' as const,
      ),
      hpOutputW: fc.double({ min: 0, max: 12000, noNaN: true }),
      immersionW: fc.double({ min: 0, max: 3000, noNaN: true }),
      immersionHeightFrac: fc.double({ min: 0, max: 1, noNaN: true }),
      nodes: fc.option(fc.integer({ min: 1, max: 40 }), { nil: undefined }),
    });
    const stepArb = fc.record({
      dtS: fc.double({ min: 1, max: 900, noNaN: true }),
      coldC: fc.double({ min: 2, max: 25, noNaN: true }),
      drawLpm: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 20, noNaN: true })),
      hpOn: fc.boolean(),
      immersionOn: fc.boolean(),
      hpFlowC: fc.option(fc.double({ min: 30, max: 75, noNaN: true }), { nil: undefined }),
    });
    fc.assert(
      fc.property(
        specArb,
        fc.double({ min: 5, max: 70, noNaN: true }),
        fc.array(stepArb, { minLength: 1, maxLength: 60 }),
        (spec, t0, steps) => {
          const state = createTank(spec, t0);
          let e = tankEnergyJ(spec, state);
          for (const step of steps) {
            const r = stepTankInPlace(spec, state, step);
            const e1 = tankEnergyJ(spec, state);
            const scale = Math.abs(e1) + r.heatInJ + Math.abs(r.drawnJ) + Math.abs(r.lossJ) + 1;
            expect(Math.abs(e1 - e - (r.heatInJ - r.drawnJ - r.lossJ))).toBeLessThan(1e-9 * scale);
            expect(isStable(state.nodesC)).toBe(true);
            for (const x of state.nodesC) expect(Number.isFinite(x)).toBe(true);
            e = e1;
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it('agrees with storedEnergyKWh of its own nodes to within 1 %', () => {
    // The model uses constant properties at 45 °C; storedEnergyKWh uses IF97 at each temperature (common practice tolerance).
    const state = createTank(base, [12, 12, 15, 25, 40, 50, 55, 56, 57, 58, 58, 58]);
    const model = tankEnergyJ(base, state, 10) / 3.6e6;
    const if97 = storedEnergyKWh({ layersC: state.nodesC, volumeL: base.volumeL, refC: 10 });
    expect(Math.abs(model / if97 - 1)).toBeLessThan(0.01);
  });
});

describe('tank model: physics', () => {
  it('cools as Newton’s law of cooling when left alone', () => {
    // T(t) = T_amb + (T0 − T_amb)·e^(−t·UA/(m·c)) (Newton’s law of cooling), uniform tank, 24 h.
    const spec = { ...base, uaWPerK: 2 };
    const state = createTank(spec, 60);
    for (let i = 0; i < 24 * 60; i++) stepTankInPlace(spec, state, idle);
    const mcJPerK = tankEnergyJ(spec, createTank(spec, 1)); // m·c of the whole tank
    const expected = 18 + 42 * Math.exp((-86400 * 2) / mcJPerK);
    for (const t of state.nodesC) expect(t).toBeCloseTo(expected, 6);
  });

  it('plate heat exchanger takes from the bottom and returns hot water at the top', () => {
    const state = createTank(base, 15);
    const r = stepTank(base, state, { ...idle, hpOn: true, hpFlowC: 55 });
    const t = r.state.nodesC;
    // All of the step's heat arrives in the top node; the rest of the column only moves down.
    expect(t[t.length - 1]!).toBeGreaterThan(19.5);
    for (let i = 0; i < t.length - 2; i++) expect(t[i]!).toBeCloseTo(15, 3);
    expect(r.hpHeatJ).toBeCloseTo(6000 * 60, 3);
    expect(state.nodesC[0]).toBe(15); // stepTank leaves its input alone
    // After long enough, the tank reaches the flow temperature and the heat pump can add no more.
    let s = r.state;
    let last = r;
    for (let i = 0; i < 300; i++) {
      last = stepTank(base, s, { ...idle, hpOn: true, hpFlowC: 55 });
      s = last.state;
    }
    expect(Math.max(...s.nodesC)).toBeLessThanOrEqual(55 + 1e-9);
    expect(last.hpHeatJ).toBeLessThan(6000 * 60 * 0.05);
  });

  it('coil heats the bottom zone and the warmed water rises', () => {
    const spec: TankSpec = { ...base, heatSource: 'hp_coil' };
    const state = createTank(spec, [10, 10, 10, 10, 10, 10, 50, 50, 50, 50, 50, 50]);
    const r = stepTank(spec, state, { ...idle, hpOn: true });
    expect(r.hpHeatJ).toBeGreaterThan(0);
    expect(r.state.nodesC[0]!).toBeGreaterThan(10.5);
    expect(Math.abs(r.state.nodesC[11]! - 50)).toBeLessThan(0.05); // the top is untouched by a coil at the bottom
    expect(isStable(r.state.nodesC)).toBe(true);
  });

  it('immersion heats its node and buoyancy mixes what is above it', () => {
    const spec: TankSpec = { ...base, uaWPerK: 0, immersionHeightFrac: 0.5 };
    const state = createTank(spec, 40);
    const r = stepTank(spec, state, { ...idle, immersionOn: true, dtS: 600 });
    const t = r.state.nodesC;
    expect(r.immersionHeatJ).toBeCloseTo(3000 * 600, 6);
    expect(t[0]!).toBeCloseTo(40, 3); // below the element: unchanged
    const k = Math.floor(0.5 * tankNodeCount(spec));
    for (let i = k; i < t.length; i++) expect(t[i]!).toBeCloseTo(t[t.length - 1]!, 9); // mixed zone above
    expect(t[k]!).toBeGreaterThan(40.5);
    // The element's thermostat stops it at 65 °C (immersionStatC default).
    let s = r.state;
    for (let i = 0; i < 200; i++) s = stepTank(spec, s, { ...idle, immersionOn: true, dtS: 600 }).state;
    expect(Math.max(...s.nodesC)).toBeLessThanOrEqual(65 + 1e-9);
  });

  it('takes a diverter’s share of the element’s rating, never more than the rating', () => {
    const spec: TankSpec = { ...base, uaWPerK: 0, immersionHeightFrac: 0.5 };
    // An element turns all its electricity into heat in the water (first law; common practice): 1200 W × 600 s.
    const share = stepTank(spec, createTank(spec, 40), { ...idle, immersionOn: true, immersionPowerW: 1200, dtS: 600 });
    expect(share.immersionHeatJ).toBeCloseTo(1200 * 600, 6);
    const over = stepTank(spec, createTank(spec, 40), { ...idle, immersionOn: true, immersionPowerW: 9000, dtS: 600 });
    expect(over.immersionHeatJ).toBeCloseTo(3000 * 600, 6);
    expect(() => stepTank(spec, createTank(spec, 40), { ...idle, immersionOn: true, immersionPowerW: -1 })).toThrow(
      /immersionPowerW/,
    );
  });

  it('draws hot from the top and refills cold at the bottom', () => {
    const spec: TankSpec = { ...base, uaWPerK: 0 };
    const state = createTank(spec, 55);
    const r = stepTank(spec, state, { ...idle, drawLpm: 10 });
    expect(r.outletC).toBeCloseTo(55, 1);
    // 10 L of 55 °C water replaced by 10 °C water: ≈ 10 kg·c·45 K (first law; common practice).
    expect(r.drawnJ / (10 * 0.99 * 4180 * 45)).toBeCloseTo(1, 1);
    expect(r.state.nodesC[0]!).toBeLessThan(55);
    expect(r.state.nodesC[11]!).toBeCloseTo(55, 6);
  });

  it('mixes an inverted starting profile into a stable one', () => {
    const state = createTank(base, [60, 60, 60, 10, 10, 10, 10, 10, 10, 10, 10, 10]);
    const r = stepTank(base, state, idle);
    expect(isStable(r.state.nodesC)).toBe(true);
  });
});

describe('tank model: sensors and input', () => {
  it('samples sensorCount readings bottom to top', () => {
    const spec: TankSpec = { ...base, sensorCount: 8, nodes: 16 };
    const nodes = Array.from({ length: 16 }, (_, i) => 10 + i * 3);
    const readings = sensorReadings(spec, { nodesC: nodes });
    expect(readings).toHaveLength(8);
    // Sensor j sits at (j + 0.5)/8 of the height: midway between node centres 2j and 2j+1 (linear interpolation).
    for (const [j, r] of readings.entries()) expect(r).toBeCloseTo(10 + (2 * j + 0.5) * 3, 9);
    // A tank created from sensor readings reproduces them at the inner sensors (ends are held flat).
    const again = sensorReadings(spec, createTank(spec, readings));
    for (let j = 1; j < 7; j++) expect(again[j]!).toBeCloseTo(readings[j]!, 9);
  });

  it('uses at least 12 nodes by default', () => {
    expect(tankNodeCount({ ...base, sensorCount: 8 })).toBe(12);
    expect(tankNodeCount({ ...base, sensorCount: 16 })).toBe(16);
  });

  it('refuses bad specs, states and steps with the field named', () => {
    expect(() => createTank({ ...base, volumeL: -1 }, 40)).toThrow(
      /spec.volumeL is -1: it must be a positive number in litres/,
    );
    expect(() => createTank({ ...base, heatSource: 'solar' as never }, 40)).toThrow(/spec.heatSource/);
    expect(() => createTank(base, [1, 2, 3])).toThrow(ThermalInputError);
    const state = createTank(base, 40);
    expect(() => stepTank(base, state, { ...idle, dtS: Number.NaN })).toThrow(/inputs.dtS is NaN/);
    expect(() => stepTank(base, state, { ...idle, drawLpm: -2 })).toThrow(/inputs.drawLpm is -2/);
    expect(() => stepTank(base, { nodesC: [40, Number.NaN] }, idle)).toThrow(/state.nodesC/);
    expect(() => stepTank(base, state, { ...idle, hpOn: 'yes' as never })).toThrow(
      'inputs.hpOn must be true or false.',
    );
    const broken = { nodesC: state.nodesC.map((t, i) => (i === 4 ? Number.NaN : t)) };
    expect(() => stepTank(base, broken, idle)).toThrow(
      'state.nodesC[4] is NaN: every node temperature must be a finite number in °C.',
    );
  });
});
