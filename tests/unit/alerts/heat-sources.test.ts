// Every alert rule against every heat source: whether it applies, and that where it applies a
// faulty input raises it (and where it does not, the same input raises nothing of that kind).
// Each faulty input runs through the engine exactly as stored readings do.
import { describe, expect, it } from 'vitest';
import {
  evaluateClock,
  evaluateReadings,
  type EngineState,
  type TankFacts,
  type Transition,
} from '../../../src/lib/alerts/engine';
import { ruleApplies } from '../../../src/lib/alerts/applicability';
import { defaultThresholds as th } from '../../../src/lib/alerts/thresholds';
import { alertKinds, type AlertKind } from '../../../src/lib/alerts/types';
import { heatSourceKinds, type HeatSource } from '../../../src/lib/heat-sources';
import type { Reading } from '../../../src/lib/telemetry/wire';

const MIN = 60_000;
const DAY = 24 * 60 * MIN;
// 05:00 UTC on a November weekday (Europe/London is on UTC then): the look-ahead covers the morning draws.
const t0 = Date.UTC(2026, 10, 2, 5);
const r = (min: number, layersC: (number | null)[], extra: Partial<Reading> = {}): Reading => ({
  ts: t0 + min * MIN,
  layersC,
  compressor: false,
  immersionW: 0,
  drawLpm: 0,
  ...extra,
});
/** A healthy column: warm, a little jitter at the top so no sensor looks stuck. */
const steady = (min: number, extra: Partial<Reading> = {}) => r(min, [20, 35, 50, 55 + ((min % 3) - 1) * 0.02], extra);
const minutes = (n: number, f: (m: number) => Reading) => Array.from({ length: n }, (_, m) => f(m));

const facts = (heatSource: HeatSource): TankFacts => ({
  volumeL: 200,
  sensorCount: 4,
  heatSource,
  declaredLossW: 57,
  occupants: 2,
});

/** Newton cooling (T = Tamb + ΔT0·e^(−t·UA/(m·c)); Newton's law of cooling) at a loss of `lossW` at 45 K, then a reheat. */
function cooling(startMin: number, lossW: number): Reading[] {
  const ua = lossW / 45;
  const mc = 200 * 4180; // 200 L of water, c ≈ 4.18 kJ/(kg·K) (IAPWS-IF97 near 40 °C, rounded)
  const out = minutes(6 * 60, (m) => {
    const excess = 40 * Math.exp((-ua * m * 60) / mc);
    return r(startMin + m, [20 + excess, 20 + excess, 20 + excess, 20 + excess + (m % 2) * 0.01]);
  });
  out.push(r(startMin + 6 * 60, [40, 40, 40, 40], { compressor: true }));
  return out;
}

type Fault = { kind: AlertKind; run: (tank: TankFacts) => Transition[] };
/** The readings in batches of ten, as the ingest worker hands them over, the stored alerts kept up to date between batches. */
const readingsOnly =
  (readings: Reading[]) =>
  (tank: TankFacts): Transition[] => {
    let state: EngineState | null = null;
    const open = new Set<AlertKind>(),
      all: Transition[] = [];
    for (let i = 0; i < readings.length; i += 10) {
      const res = evaluateReadings(state, readings.slice(i, i + 10), tank, th, open);
      state = res.state;
      for (const t of res.transitions) {
        all.push(t);
        if (t.type === 'open') open.add(t.kind);
        else open.delete(t.kind);
      }
    }
    return all;
  };

/** One faulty input per rule, each past its threshold with room to spare (thresholds.ts holds each value's source). */
const faults: Fault[] = [
  // Silent for longer than offlineAfterMin (20 min, common practice).
  {
    kind: 'offline',
    run: (tank) =>
      evaluateClock(
        evaluateReadings(null, [steady(0)], tank, th, new Set()).state,
        t0 + 30 * MIN,
        tank,
        th,
        new Set(),
        null,
      ).transitions,
  },
  // Sensor 2 missing for longer than sensorRangeMin (5 min, common practice).
  { kind: 'sensor_fault', run: readingsOnly(minutes(10, (m) => r(m, [20, null, 50, 55 + (m % 2) * 0.02]))) },
  // Never 60 °C across half the volume for an hour within 7 days (HSE HSG274 Part 2 (2014); hold and share common practice).
  {
    kind: 'legionella_risk',
    run: (tank) =>
      evaluateClock(
        evaluateReadings(null, [steady(0)], tank, th, new Set()).state,
        t0 + 7 * DAY + 30 * MIN,
        tank,
        th,
        new Set(),
        null,
      ).transitions,
  },
  // A compressor start every 20 min, each run 3 min: far inside the 60 min gap and 10 min run (common practice).
  { kind: 'short_cycling', run: readingsOnly(minutes(180, (m) => steady(m, { compressor: m % 20 < 3 }))) },
  // A cold cylinder (V40 nothing) for four hours through a four-person home's usual morning draws
  // (EN 16147 profile M prior scaled by occupants): short for longer than lowHotWaterMin (120 min, common practice).
  {
    kind: 'low_hot_water',
    run: (tank) =>
      readingsOnly(minutes(240, (m) => r(m, [12, 13, 14, 15 + (m % 2) * 0.02])))({ ...tank, occupants: 4 }),
  },
  // The immersion alone heating the water for 25 h: 100 % of the heat against a 20 % limit (common practice).
  {
    kind: 'immersion_heavy',
    run: readingsOnly(
      minutes(25 * 60, (m) => {
        const c = 15 + (45 * m) / (25 * 60);
        return r(m, [c, c + 0.5, c + 1, c + 1.5], { immersionW: 500 });
      }),
    ),
  },
  // Two cooling periods at 120 W against a declared 57 W: more than the 50 % margin (common practice).
  { kind: 'heat_loss', run: readingsOnly([...cooling(0, 120), ...cooling(600, 120)]) },
];

/** Which rules each heat source takes, written out by hand. */
const expected: Record<HeatSource, Record<AlertKind, boolean>> = {
  hp_plate: {
    offline: true,
    sensor_fault: true,
    legionella_risk: true,
    short_cycling: true,
    low_hot_water: true,
    immersion_heavy: true,
    heat_loss: true,
  },
  hp_coil: {
    offline: true,
    sensor_fault: true,
    legionella_risk: true,
    short_cycling: true,
    low_hot_water: true,
    immersion_heavy: true,
    heat_loss: true,
  },
  immersion_only: {
    offline: true,
    sensor_fault: true,
    legionella_risk: true,
    short_cycling: false,
    low_hot_water: true,
    immersion_heavy: false,
    heat_loss: true,
  },
  boiler_coil: {
    offline: true,
    sensor_fault: true,
    legionella_risk: true,
    short_cycling: false,
    low_hot_water: true,
    immersion_heavy: false,
    heat_loss: true,
  },
};

describe('alert rules per heat source', () => {
  it('has a faulty input for every rule', () => {
    expect(faults.map((f) => f.kind).sort()).toEqual([...alertKinds].sort());
  });

  for (const source of heatSourceKinds) {
    describe(source, () => {
      for (const { kind, run } of faults) {
        const applies = expected[source][kind];
        it(`${kind}: ${applies ? 'applies, and raises on a faulty input' : 'does not apply, and the same input raises nothing'}`, () => {
          expect(ruleApplies(kind, source)).toBe(applies);
          const opened = run(facts(source)).filter((t) => t.type === 'open' && t.kind === kind);
          expect(opened).toHaveLength(applies ? 1 : 0);
          if (applies)
            expect((opened[0] as Extract<Transition, { type: 'open' }>).evidence.summary.length).toBeGreaterThan(10);
        });
      }
    });
  }

  it('after short-cycling, keeps the alert open on a heat-pump cylinder but resolves it where there is no heat pump', () => {
    // The same history on each: a heat pump short-cycling (alert open), then 40 quiet minutes (past
    // short-cycling's 30 min clear delay, engine.ts) without a healthy run to show it has stopped.
    const history = minutes(180, (m) => steady(m, { compressor: m % 20 < 3 }));
    const hp = evaluateReadings(null, history, facts('hp_plate'), th, new Set());
    expect(hp.transitions.map((t) => `${t.type} ${t.kind}`)).toContain('open short_cycling');
    const quiet = minutes(40, (m) => steady(200 + m));
    for (const source of heatSourceKinds) {
      const res = evaluateReadings(
        structuredClone(hp.state),
        quiet,
        facts(source),
        th,
        new Set<AlertKind>(['short_cycling']),
      );
      const resolved = res.transitions.some((t) => t.type === 'resolve' && t.kind === 'short_cycling');
      expect(resolved, source).toBe(!expected[source].short_cycling);
    }
  });
});
