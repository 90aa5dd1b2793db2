// Rule thresholds at their edges, and the lifecycle's hysteresis, on hand-made readings.
import { describe, expect, it } from 'vitest';
import { evaluateClock, evaluateReadings, type EngineState, type TankFacts } from '../../../src/lib/alerts/engine';
import {
  defaultThresholds,
  resolveThresholds,
  thresholdOverridesSchema,
  type Thresholds,
} from '../../../src/lib/alerts/thresholds';
import { initialLegionella, stepLegionella, legionellaFinding } from '../../../src/lib/alerts/rules/legionella';
import { initialShortCycle, shortCycleFinding, stepShortCycle } from '../../../src/lib/alerts/rules/short-cycling';
import { heatLossFinding, initialHeatLoss, stepHeatLoss } from '../../../src/lib/alerts/rules/heat-loss';
import { legionellaExposure } from '../../../src/lib/thermal';
import type { Reading } from '../../../src/lib/telemetry/wire';
import type { AlertKind } from '../../../src/lib/alerts/types';

const MIN = 60_000;
const t0 = Date.UTC(2026, 10, 2);
const th: Thresholds = defaultThresholds;
const tank: TankFacts = { volumeL: 200, sensorCount: 4, heatSource: 'hp_plate', declaredLossW: 57, occupants: 2 };
const r = (min: number, layersC: (number | null)[], extra: Partial<Reading> = {}): Reading => ({
  ts: t0 + min * MIN,
  layersC,
  compressor: false,
  immersionW: 0,
  drawLpm: 0,
  ...extra,
});
const steady = (min: number) => r(min, [20, 35, 50, 55 + ((min % 3) - 1) * 0.02]);

function run(readings: Reading[], thresholds = th, state: EngineState | null = null, open = new Set<AlertKind>()) {
  const res = evaluateReadings(state, readings, tank, thresholds, open);
  for (const t of res.transitions)
    if (t.type === 'open') open.add(t.kind);
    else open.delete(t.kind);
  return { ...res, open };
}

describe('short-cycling', () => {
  // At most one hot-water compressor start an hour (common practice): a start exactly 60 min after the last is allowed.
  const cycles = (gapMin: number, runMin: number, n: number) => {
    const s = initialShortCycle();
    for (let i = 0; i < n; i++) {
      const on = i * gapMin;
      stepShortCycle(s, r(on - 1, [1, 2, 3, 4]), th);
      for (let m = on; m < on + runMin; m++) stepShortCycle(s, r(m, [1, 2, 3, 4], { compressor: true }), th);
      stepShortCycle(s, r(on + runMin, [1, 2, 3, 4]), th);
    }
    return s;
  };
  it('allows starts exactly the gap apart and runs exactly the minimum long', () => {
    const s = cycles(60, 10, 5);
    expect(s.violations).toEqual([]);
    expect(shortCycleFinding(s, t0 + 300 * MIN, th)).toEqual({ active: false });
  });
  it('counts starts a minute too soon, and opens at the third within the window', () => {
    const s = cycles(59, 10, 3);
    expect(s.violations.map((v) => v.kind)).toEqual(['gap', 'gap']);
    expect(shortCycleFinding(s, t0 + 200 * MIN, th).active).toBeNull(); // two: in the band, nothing changes
    const s4 = cycles(59, 10, 4);
    expect(shortCycleFinding(s4, t0 + 200 * MIN, th).active).toBe(true);
  });
  it('counts a run a minute shorter than the minimum', () => {
    expect(cycles(60, 9, 3).violations.map((v) => v.kind)).toEqual(['short_run', 'short_run', 'short_run']);
  });
});

describe('offline', () => {
  it('is offline only when silent for longer than the limit, and resolves after readings have come back for 10 min', () => {
    const { state, open } = run([steady(0)]);
    expect(evaluateClock(state, t0 + 20 * MIN, tank, th, open, null).transitions).toEqual([]);
    const c = evaluateClock(state, t0 + 20 * MIN + 1, tank, th, open, null);
    expect(c.transitions).toMatchObject([{ type: 'open', kind: 'offline', at: t0 + 20 * MIN }]);
    open.add('offline');
    const back = run([steady(40)], th, c.state, open);
    expect(evaluateClock(back.state, t0 + 41 * MIN, tank, th, open, null).transitions).toEqual([]);
    expect(evaluateClock(back.state, t0 + 51 * MIN, tank, th, open, null).transitions).toMatchObject([
      { type: 'resolve', kind: 'offline' },
    ]);
  });
  it('says nothing about a tank that has never reported', () => {
    expect(evaluateClock(null, t0, tank, th, new Set(), null).transitions).toEqual([]);
  });
});

describe('sensor faults', () => {
  it('opens on a missing sensor after the persistence, not before', () => {
    const four = run([0, 1, 2, 3, 4].map((m) => r(m, [20, null, 50, 55])));
    expect(four.transitions).toEqual([]);
    const five = run([r(5, [20, null, 50, 55])], th, four.state, four.open);
    expect(five.transitions).toMatchObject([{ type: 'open', kind: 'sensor_fault' }]);
  });
  it('treats the plausible range as inclusive at both ends', () => {
    expect(run(Array.from({ length: 10 }, (_, m) => r(m, [1, 35, 50, 99]))).transitions).toEqual([]);
    expect(run(Array.from({ length: 10 }, (_, m) => r(m, [0.9, 35, 50, 55]))).transitions).toMatchObject([
      { kind: 'sensor_fault' },
    ]);
  });
  it('allows an inversion of exactly the limit, not more, and only after 30 minutes', () => {
    const at = (k: number) => Array.from({ length: 40 }, (_, m) => r(m, [20, 50 + k, 50, 55]));
    expect(run(at(3)).transitions).toEqual([]);
    const res = run(at(3.01));
    expect(res.transitions).toMatchObject([{ type: 'open', kind: 'sensor_fault', at: t0 + 30 * MIN }]);
  });
  it('finds a stuck sensor while its neighbour moves, and not while everything is still', () => {
    const moving = Array.from({ length: 121 }, (_, m) => r(m, [20 + m * 0.05, 30, 48 + (m % 2) * 0.02, 55]));
    const res = run(moving);
    expect(res.transitions).toMatchObject([{ kind: 'sensor_fault' }]);
    expect((res.transitions[0] as any).evidence.summary).toMatch(/sensor 2 has not changed/i);
    const still = Array.from({ length: 121 }, (_, m) => r(m, [20, 30, 48, 55]));
    expect(run(still).transitions).toEqual([]);
  });
  it('resolves only after six clear hours: no flapping', () => {
    const bad = run(Array.from({ length: 10 }, (_, m) => r(m, [20, null, 50, 55])));
    const okUntil = (mins: number) => Array.from({ length: mins }, (_, m) => steady(10 + m));
    const early = run(okUntil(359), th, structuredClone(bad.state), new Set(bad.open));
    expect(early.transitions).toEqual([]);
    const late = run(okUntil(361), th, structuredClone(bad.state), new Set(bad.open));
    expect(late.transitions).toMatchObject([{ type: 'resolve', kind: 'sensor_fault' }]);
  });
});

describe('legionella', () => {
  // 60 °C: HSE HSG274 Part 2 (2014). Hold 60 min across 50% of the volume (common practice).
  const week = 7 * 24 * 60;
  it('counts time at temperature as the thermal core does', () => {
    const series = Array.from({ length: 200 }, (_, m) => ({
      ts: t0 + m * MIN,
      layersC: [20, m > 30 && m < 120 ? 60 : 59.9, 61, 62],
    }));
    const ex = legionellaExposure(
      series.map((x) => ({ t: x.ts, layersC: x.layersC })),
      { thresholdC: 60, holdMin: 60 },
    );
    expect(ex.layerHeld).toEqual([false, true, true, true]);
    const s = initialLegionella();
    for (const x of series.slice(0, 60)) stepLegionella(s, x, th);
    expect(s.lastHeldAt).toBeNull(); // layers 3 and 4 (half the volume) have held 59 min
    stepLegionella(s, series[60]!, th);
    expect(s.lastHeldAt).toBe(t0 + 60 * MIN);
    for (const x of series.slice(61)) stepLegionella(s, x, th);
    expect(s.lastHeldAt).toBe(t0 + 199 * MIN); // still held at the last reading
  });
  it('clears with a hold of exactly the minimum, and raises a week after the last one', () => {
    const s = initialLegionella();
    for (let m = 0; m <= 60; m++) stepLegionella(s, { ts: t0 + m * MIN, layersC: [20, 30, 60, 60] }, th);
    expect(s.lastHeldAt).toBe(t0 + 60 * MIN);
    expect(legionellaFinding(s, t0 + 60 * MIN + week * MIN, th).active).toBe(false);
    expect(legionellaFinding(s, t0 + 60 * MIN + week * MIN + 1, th).active).toBe(true);
    const short = initialLegionella();
    for (let m = 0; m <= 59; m++) stepLegionella(short, { ts: t0 + m * MIN, layersC: [20, 30, 60, 60] }, th);
    expect(short.lastHeldAt).toBeNull();
  });
  it('does not count a quarter of the volume at temperature, nor a gap in the readings', () => {
    const s = initialLegionella();
    for (let m = 0; m <= 120; m++) stepLegionella(s, { ts: t0 + m * MIN, layersC: [20, 30, 50, 65] }, th);
    expect(s.lastHeldAt).toBeNull();
    const g = initialLegionella();
    for (const m of [0, 30, 61]) stepLegionella(g, { ts: t0 + m * MIN, layersC: [20, 30, 65, 65] }, th); // 31-min gap
    expect(g.lastHeldAt).toBeNull();
  });
});

describe('heat loss', () => {
  // Newton cooling with UA chosen so the loss at 45 K is 120 W against a declared 57 W (more than 50% above).
  const cooling = (s: ReturnType<typeof initialHeatLoss>, startMin: number, lossW: number) => {
    const ua = lossW / 45;
    const mc = 200 * 4180;
    for (let m = 0; m < 6 * 60; m++) {
      const excess = 40 * Math.exp((-ua * m * 60) / mc);
      stepHeatLoss(s, r(startMin + m, [20 + excess, 20 + excess, 20 + excess, 20 + excess]), 20 + excess, 200, 57, th);
    }
    stepHeatLoss(s, r(startMin + 6 * 60, [40, 40, 40, 40], { compressor: true }), 40, 200, 57, th);
  };
  it('raises after two cooling periods well above the declared loss, and not after one', () => {
    const s = initialHeatLoss();
    cooling(s, 0, 120);
    expect(heatLossFinding(s, th).active).toBeNull();
    cooling(s, 600, 120);
    const f = heatLossFinding(s, th);
    expect(f.active).toBe(true);
    expect(s.fits[1]!.lossW).toBeGreaterThan(110);
  });
  it('stays clear when the loss is as declared', () => {
    const s = initialHeatLoss();
    cooling(s, 0, 57);
    cooling(s, 600, 57);
    expect(heatLossFinding(s, th)).toEqual({ active: false });
  });
});

describe('thresholds', () => {
  it('names the field a company set out of range', () => {
    const bad = thresholdOverridesSchema.safeParse({ shortCycleMinGapMin: 2, legionellaC: 'hot' });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['legionellaC', 'shortCycleMinGapMin']);
    expect(thresholdOverridesSchema.safeParse({ sensorMinC: 20, sensorMaxC: 60 }).success).toBe(true);
    expect(thresholdOverridesSchema.safeParse({ sensorMinC: 30, sensorMaxC: 29 }).success).toBe(false);
  });
  it('merges a company’s changes over the defaults', () => {
    const t = resolveThresholds({ offlineAfterMin: 45, severity: { offline: 'critical' } });
    expect(t.offlineAfterMin).toBe(45);
    expect(t.legionellaC).toBe(60); // HSE HSG274 Part 2 (2014)
    expect(t.shortCycleMinGapMin).toBe(60); // common practice
    expect(t.severity.offline).toBe('critical');
    expect(t.severity.legionella_risk).toBe('critical');
  });
  it('replays nothing twice: readings older than the state are skipped', () => {
    const first = run([0, 1, 2, 3, 4, 5].map((m) => r(m, [20, null, 50, 55])));
    expect(first.transitions).toHaveLength(1);
    const again = run(
      [0, 1, 2, 3, 4, 5].map((m) => r(m, [20, null, 50, 55])),
      th,
      first.state,
      new Set(),
    );
    expect(again.transitions).toEqual([]);
  });
});
