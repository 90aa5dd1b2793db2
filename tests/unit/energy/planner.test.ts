import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  buildPlanModel,
  commandSchedule,
  demandPrior,
  demandSeries,
  EnergyInputError,
  kWhPerLitreAt40,
  planCharge,
  solveDp,
  v40Curve,
} from '../../../src/lib/energy/index.js';
import type { ChargePlan, ChargePlanInput, PlanAction, PlanModel } from '../../../src/lib/energy/index.js';
import {
  createTank,
  estimatedCop,
  mixedWaterLitres,
  stepTankInPlace,
  tankNodeCount,
} from '../../../src/lib/thermal/index.js';
import type { TankSpec } from '../../../src/lib/thermal/index.js';

const MON = Date.UTC(2025, 0, 6); // Monday 00:00 GMT
const spec: TankSpec = {
  volumeL: 200,
  sensorCount: 12,
  heightM: 1.4,
  ambientC: 18,
  uaWPerK: 1.5,
  heatSource: 'hp_plate',
  hpOutputW: 5000,
  immersionW: 3000,
  immersionHeightFrac: 0.6,
};
// Ideal-COP quality grade 0.4 for an air-source heat pump (common practice), water at 55 °C, air at 5 °C.
const COP = estimatedCop({ sinkC: 55, sourceC: 5 });
/** Minimum V40 of profile M, Regulation (EU) No 814/2013 Annex III: the comfort floor used here. */
const FLOOR_M_L = 65;

/** Exhaustive search over every action sequence of the same model, with the start rule written out afresh. */
function bruteForce(
  model: PlanModel,
  floors: number[],
  credit: number,
  penalty: number,
  running: boolean,
  stepsSinceStart: number,
  k: number,
) {
  let bestS = Infinity,
    bestC = Infinity;
  const go = (t: number, j: number, on: boolean, ago: number, s: number, c: number): void => {
    if (t === model.steps) {
      const total = c - credit * Math.max(0, model.energyAt(t, j));
      if (s < bestS - 1e-9 || (s <= bestS + 1e-9 && total < bestC - 1e-9)) {
        bestS = s;
        bestC = total;
      }
      return;
    }
    for (const a of model.actions) {
      const hp = (a & 2) !== 0;
      const start = hp && !on;
      if (start && ago < k) continue; // two starts at least k steps apart
      const tr = model.transition(t, j, a);
      go(
        t + 1,
        tr.next,
        hp,
        start ? 1 : ago + 1,
        s + Math.max(0, floors[t]! - tr.lowV40),
        c + tr.costPence + (start ? penalty : 0),
      );
    }
  };
  go(0, model.j0, running, stepsSinceStart, 0, 0);
  return { shortfall: bestS, objective: bestC };
}

describe('charge planner: dynamic programme', () => {
  const small: TankSpec = { ...spec, volumeL: 120, hpOutputW: 3000, immersionW: 2000 };

  it('finds the optimum of brute-force enumeration on small cases, with the one-start-per-hour rule live (property)', () => {
    fc.assert(
      fc.property(
        fc.record({
          stepMin: fc.constantFrom(15, 30),
          steps: fc.integer({ min: 3, max: 6 }),
          prices: fc.array(fc.integer({ min: -5, max: 45 }), { minLength: 6, maxLength: 6 }),
          demand: fc.array(fc.constantFrom(0, 0, 10, 25, 40), { minLength: 6, maxLength: 6 }),
          t0: fc.integer({ min: 25, max: 55 }),
          floor: fc.constantFrom(0, 30, 65, 120),
          running: fc.boolean(),
          since: fc.integer({ min: 0, max: 4 }),
          penalty: fc.constantFrom(0, 0.5),
        }),
        (c) => {
          const k = Math.ceil(60 / c.stepMin);
          const cop = new Array(c.steps).fill(COP);
          const model = buildPlanModel({
            spec: small,
            state: createTank(small, c.t0),
            coldC: 10,
            stepMin: c.stepMin,
            importPence: c.prices.slice(0, c.steps),
            demandLitres40: c.demand.slice(0, c.steps),
            cop,
            hpOutputW: small.hpOutputW,
            immersionW: small.immersionW,
            hpTopC: 55,
            gridKWh: 0.05,
            curve: v40Curve(small, 10, 55),
          });
          const floors = new Array(c.steps).fill(c.floor);
          const since = Math.min(k, c.running ? Math.max(1, c.since) : c.since);
          const dp = solveDp(model, {
            floorsL40: floors,
            terminalCreditPence: 2,
            startPenaltyPence: c.penalty,
            memory: { running: c.running, stepsSinceStart: since, spacingSteps: k },
          });
          const bf = bruteForce(model, floors, 2, c.penalty, c.running, since, k);
          expect(dp.shortfallL40).toBeCloseTo(bf.shortfall, 6);
          expect(dp.objectivePence).toBeCloseTo(bf.objective, 6);
        },
      ),
      { numRuns: 40 },
    );
  });

  it('uses a V40 curve measured on the tank model that never falls as stored heat rises, and stays below E/k40', () => {
    const curve = v40Curve(spec, 10, 55);
    for (let i = 1; i < curve.energyKWh.length; i++) {
      expect(curve.energyKWh[i]!).toBeGreaterThan(curve.energyKWh[i - 1]!);
      expect(curve.litres40[i]!).toBeGreaterThanOrEqual(curve.litres40[i - 1]!);
      // Heat stored above 40 °C is at most all of the heat (V40 definition, EN 16147).
      expect(curve.litres40[i]! * kWhPerLitreAt40(10)).toBeLessThanOrEqual(curve.energyKWh[i]! + 1e-9);
    }
    // A full tank at 55 °C gives V40 = V·(55 − 10)/(40 − 10) = 1.5·V (EN 16147 mixing rule).
    expect(curve.litres40[curve.litres40.length - 1]).toBeCloseTo(1.5 * spec.volumeL, 6);
  });
});

/** Re-run a plan through the tank model, written out here: draws first in each step, 5-minute sub-steps. */
function resimulate(input: ChargePlanInput, plan: ChargePlan): number[] {
  const state = { nodesC: input.state.nodesC.slice() };
  const n = tankNodeCount(input.spec);
  const lows: number[] = [];
  const k40J = kWhPerLitreAt40(10) * 3.6e6;
  plan.steps.forEach((s, t) => {
    let owed = input.demandLitres40[t]! * k40J;
    let low = Infinity;
    for (let u = 0; u < 6; u++) {
      const lift = state.nodesC[n - 1]! - 10;
      const drawLpm = owed > 0 ? (lift > 0.5 ? Math.min(12, owed / (4180 * lift) / 5) : 12) : 0;
      const r = stepTankInPlace(input.spec, state, {
        dtS: 300,
        coldC: 10,
        drawLpm,
        hpOn: s.heatPump,
        immersionOn: s.immersion,
        hpOutputW: input.spec.hpOutputW,
        hpFlowC: 55,
      });
      owed -= r.drawnJ;
      low = Math.min(
        low,
        mixedWaterLitres({ layersC: state.nodesC, volumeL: input.spec.volumeL, coldC: 10, deliveryC: 40 }),
      );
    }
    lows.push(low);
  });
  return lows;
}

function realisticPrices(steps: number, startMs: number): number[] {
  // Inputs only: a cheap overnight window 00:30–04:30 and an evening peak 16:00–19:00 (GMT in January).
  return Array.from({ length: steps }, (_, i) => {
    const h = (((startMs / 3_600_000 + i / 2) % 24) + 24) % 24;
    return h >= 0.5 && h < 4.5 ? 7.5 : h >= 16 && h < 19 ? 38 : 26;
  });
}

function homeInput(over: Partial<ChargePlanInput> & { occupants?: number; t0?: number } = {}): ChargePlanInput {
  const startMs = over.startMs ?? MON;
  const steps = over.importPence?.length ?? 96;
  const s = over.spec ?? spec;
  return {
    spec: s,
    state: over.state ?? createTank(s, over.t0 ?? 50),
    startMs,
    importPence: over.importPence ?? realisticPrices(steps, startMs),
    demandLitres40:
      over.demandLitres40 ??
      demandSeries(
        { timeZone: 'UTC', litres40ByHour: demandPrior(over.occupants ?? 3), weeksObserved: [], prior: [] },
        startMs,
        steps,
      ),
    comfortFloorL40: over.comfortFloorL40 ?? FLOOR_M_L,
    cop: over.cop ?? COP,
    ...(over.compressor ? { compressor: over.compressor } : {}),
    ...(over.stepMin ? { stepMin: over.stepMin } : {}),
    ...(over.limits ? { limits: over.limits } : {}),
  };
}

describe('charge planner: plans checked through the tank model', () => {
  it('never plans below the comfort floor when the plan is run through the tank model (property)', () => {
    fc.assert(
      fc.property(
        fc.record({
          occupants: fc.integer({ min: 1, max: 5 }),
          volumeL: fc.constantFrom(150, 210, 300),
          hpOutputW: fc.constantFrom(3000, 5000, 8000),
          t0: fc.integer({ min: 45, max: 55 }),
          floor: fc.constantFrom(40, 65, 100),
          prices: fc.array(fc.integer({ min: 4, max: 45 }), { minLength: 48, maxLength: 48 }),
        }),
        (c) => {
          const s: TankSpec = { ...spec, volumeL: c.volumeL, hpOutputW: c.hpOutputW };
          const input = homeInput({
            spec: s,
            t0: c.t0,
            occupants: c.occupants,
            comfortFloorL40: c.floor,
            importPence: c.prices,
          });
          const plan = planCharge(input);
          expect(plan.floorMet).toBe(true);
          const lows = resimulate(input, plan);
          lows.forEach((v, t) => {
            expect(v, `step ${t}`).toBeGreaterThanOrEqual(c.floor - 1e-6);
            expect(v).toBeCloseTo(plan.steps[t]!.lowestV40, 6);
          });
        },
      ),
      { numRuns: 12 },
    );
  });

  it('on a realistic day charges in the cheap overnight window and never in the evening peak', () => {
    const startMs = MON + 12 * 3_600_000; // Monday noon, tank half used
    const input = homeInput({ startMs, t0: 50 });
    const plan = planCharge(input);
    expect(plan.floorMet).toBe(true);
    const inWindow = (p: number): boolean => p === 7.5;
    const cheapKWh = plan.steps.filter((s) => inWindow(s.importPence)).reduce((a, s) => a + s.electricityKWh, 0);
    expect(cheapKWh / plan.electricityKWh).toBeGreaterThan(0.8);
    expect(plan.steps.filter((s) => s.importPence === 38).every((s) => !s.heatPump && !s.immersion)).toBe(true);
    // The fixed thermostat heats whenever the tank cools, peak or not; the plan costs less for no less comfort.
    expect(plan.baseline.stepsBelowFloor).toEqual([]);
    expect(plan.costPence).toBeLessThan(plan.baseline.costPence);
    expect(plan.savingsPence).toBeGreaterThan(0);
    // Command windows cover exactly the planned steps.
    const hpSteps = plan.steps.filter((s) => s.heatPump).length;
    const hpMinutes = plan.schedule
      .filter((w) => w.source === 'heat_pump')
      .reduce((a, w) => a + (Date.parse(w.end) - Date.parse(w.start)) / 60_000, 0);
    expect(hpMinutes).toBe(hpSteps * 30);
  });

  it('honours at most one compressor start an hour at 15-minute steps (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 1, max: 40 }), { minLength: 48, maxLength: 48 }),
        fc.integer({ min: 40, max: 55 }),
        (prices, t0) => {
          const plan = planCharge(homeInput({ stepMin: 15, importPence: prices, t0, occupants: 4 }));
          const starts = plan.steps.filter((s) => s.heatPumpStart).map((s) => s.startMs);
          for (let i = 1; i < starts.length; i++)
            expect(starts[i]! - starts[i - 1]!).toBeGreaterThanOrEqual(60 * 60_000);
        },
      ),
      { numRuns: 10 },
    );
  });

  it('counts a start made just before the plan: no new start until an hour after it', () => {
    // 38 °C water holds no V40: the heat pump (alone: immersion left out) is wanted at once, and it is cheap.
    const prices = [1, 1, 1, 50, 50, 50, 50, 50];
    const base = { importPence: prices, t0: 38, limits: { immersionW: 0 } };
    const fresh = planCharge(homeInput(base));
    expect(fresh.steps[0]!.heatPump).toBe(true); // without the memory it starts at once
    const plan = planCharge(homeInput({ ...base, compressor: { running: false, lastStartMs: MON - 10 * 60_000 } }));
    // Started 10 minutes before: 00:00 and 00:30 are within the hour of it, 01:00 is 70 minutes after.
    expect(plan.steps[0]!.heatPump).toBe(false);
    expect(plan.steps[1]!.heatPump).toBe(false);
    expect(plan.steps[2]!.heatPump).toBe(true);
    // Still running at the start is not a start: it may carry on.
    const running = planCharge(homeInput({ ...base, compressor: { running: true, lastStartMs: MON - 10 * 60_000 } }));
    expect(running.steps[0]!.heatPump).toBe(true);
    expect(running.steps[0]!.heatPumpStart).toBe(false);
  });

  it('plans an immersion-only tank with the immersion alone', () => {
    const s: TankSpec = { ...spec, heatSource: 'immersion_only', hpOutputW: 0, immersionHeightFrac: 0.3 };
    const plan = planCharge(homeInput({ spec: s, t0: 60 }));
    expect(plan.floorMet).toBe(true);
    expect(plan.schedule.every((w) => w.source === 'immersion')).toBe(true);
    expect(plan.schedule.length).toBeGreaterThan(0);
  });

  it('reports, rather than hides, a floor it cannot meet', () => {
    const plan = planCharge(homeInput({ t0: 30, importPence: realisticPrices(8, MON) }));
    expect(plan.floorMet).toBe(false);
    expect(plan.stepsBelowFloor[0]).toBe(0); // 30 °C water holds no V40 at all
    expect(plan.steps[0]!.heatPump).toBe(true); // and it heats at once
  });

  it('is deterministic', () => {
    const input = homeInput({ importPence: realisticPrices(48, MON) });
    expect(planCharge(input)).toEqual(planCharge(input));
  });

  it('names bad input', () => {
    const input = homeInput({ importPence: realisticPrices(48, MON) });
    expect(() => planCharge({ ...input, demandLitres40: [1, 2] })).toThrowError(EnergyInputError);
    expect(() => planCharge({ ...input, cop: 0 })).toThrowError(/cop/);
    expect(() => planCharge({ ...input, startMs: MON + 60_000 })).toThrowError(/boundary/);
    expect(() => planCharge({ ...input, stepMin: 7 })).toThrowError(/stepMin/);
  });
});

describe('commandSchedule', () => {
  it('merges consecutive steps into windows per source', () => {
    const actions: PlanAction[] = [0, 2, 2, 3, 1, 0, 2];
    expect(commandSchedule(actions, MON, 30)).toEqual([
      { start: '2025-01-06T00:30:00.000Z', end: '2025-01-06T02:00:00.000Z', source: 'heat_pump' },
      { start: '2025-01-06T01:30:00.000Z', end: '2025-01-06T02:30:00.000Z', source: 'immersion' },
      { start: '2025-01-06T03:00:00.000Z', end: '2025-01-06T03:30:00.000Z', source: 'heat_pump' },
    ]);
  });
});
