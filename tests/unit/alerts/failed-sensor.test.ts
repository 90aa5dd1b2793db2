// The rules that read the whole column (heat loss, immersion share, usual demand) run on the
// tank's figures: one failed sensor is estimated by height and the rule still decides; with the
// top sensor out the figures are withheld and the rule takes nothing from those readings.
import { describe, expect, it } from 'vitest';
import { evaluateReadings, type EngineState, type TankFacts, type Transition } from '../../../src/lib/alerts/engine';
import { defaultThresholds as th } from '../../../src/lib/alerts/thresholds';
import type { AlertKind } from '../../../src/lib/alerts/types';
import type { Reading } from '../../../src/lib/telemetry/wire';

const MIN = 60_000;
const t0 = Date.UTC(2026, 10, 2, 5);
const tank: TankFacts = { volumeL: 200, sensorCount: 4, heatSource: 'hp_plate', declaredLossW: 57, occupants: 2 };
const r = (min: number, layersC: (number | null)[], extra: Partial<Reading> = {}): Reading => ({
  ts: t0 + min * MIN,
  layersC,
  compressor: false,
  immersionW: 0,
  drawLpm: 0,
  ...extra,
});

/** Which sensor, if any, reads nothing (0-based). */
type Drop = number | null;
const drop = (layers: number[], i: Drop) => layers.map((t, k) => (k === i ? null : t));

/**
 * Newton cooling (Newton's law of cooling; 200 L, c ≈ 4.18 kJ/(kg·K), IAPWS-IF97 near 40 °C,
 * rounded) of a column stratified linearly with height, at `lossW` at 45 K, then a reheat. A linear
 * profile is what interpolation by height restores exactly, so the fit must match the full column's.
 */
function cooling(startMin: number, lossW: number, missing: Drop): Reading[] {
  const ua = lossW / 45;
  const mc = 200 * 4180;
  const out: Reading[] = [];
  for (let m = 0; m < 6 * 60; m++) {
    const e = 40 * Math.exp((-ua * m * 60) / mc);
    out.push(r(startMin + m, drop([20 + 0.7 * e, 20 + 0.9 * e, 20 + 1.1 * e, 20 + 1.3 * e + (m % 2) * 0.01], missing)));
  }
  out.push(r(startMin + 6 * 60, [40, 40, 40, 40], { compressor: true }));
  return out;
}

function run(readings: Reading[]): { transitions: Transition[]; state: EngineState } {
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
  return { transitions: all, state: state! };
}
const opened = (ts: Transition[], kind: AlertKind) => ts.filter((t) => t.type === 'open' && t.kind === kind).length;

describe('column rules with a failed sensor', () => {
  it('heat loss: sensor 2 out, the cooling fits match the full column and the alert opens', () => {
    const full = run([...cooling(0, 120, null), ...cooling(600, 120, null)]);
    const one = run([...cooling(0, 120, 1), ...cooling(600, 120, 1)]);
    expect(opened(full.transitions, 'heat_loss')).toBe(1);
    expect(opened(one.transitions, 'heat_loss')).toBe(1);
    expect(one.state.heatLoss.fits).toHaveLength(full.state.heatLoss.fits.length);
    for (const [i, f] of one.state.heatLoss.fits.entries())
      expect(f.lossW).toBeCloseTo(full.state.heatLoss.fits[i]!.lossW, 0);
    // About the 120 W the curve was made with (rounding of the fit: common practice).
    expect(one.state.heatLoss.fits[1]!.lossW).toBeGreaterThan(110);
  });

  it('heat loss: the top sensor out, the figures are withheld and nothing is fitted', () => {
    const top = run([...cooling(0, 120, 3), ...cooling(600, 120, 3)]);
    expect(top.state.heatLoss.fits).toHaveLength(0);
    expect(opened(top.transitions, 'heat_loss')).toBe(0);
  });

  it('immersion share: sensor 2 out, the day is still accounted and the alert opens', () => {
    // The immersion alone heating the water for 25 h: 100 % of the heat against a 20 % limit (common practice).
    const heating = (missing: Drop) =>
      Array.from({ length: 25 * 60 }, (_, m) => {
        const c = 15 + (45 * m) / (25 * 60);
        return r(m, drop([c, c + 0.5, c + 1, c + 1.5], missing), { immersionW: 500 });
      });
    const full = run(heating(null));
    const one = run(heating(1));
    expect(opened(one.transitions, 'immersion_heavy')).toBe(1);
    const sum = (s: EngineState) => s.immersion.days.reduce((a, d) => a + d.immKWh, 0);
    // A linear column again: the estimate restores the missing layer, so the heat counted is the same.
    expect(sum(one.state)).toBeCloseTo(sum(full.state), 2);
    const top = run(heating(3));
    expect(top.state.immersion.days.every((d) => d.coveredMin === 0)).toBe(true);
  });
});
