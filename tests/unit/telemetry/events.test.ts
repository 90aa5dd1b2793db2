import { describe, expect, it } from 'vitest';
import { compressorCycles } from '../../../src/lib/thermal';
import { deriveEvents, emptyDeriveState, MAX_GAP_MS } from '../../../src/lib/telemetry/events';
import type { Reading } from '../../../src/lib/telemetry/wire';

const MIN = 60_000;
const r = (i: number, over: Partial<Reading> = {}): Reading => ({
  ts: i * MIN,
  layersC: [20, 40, 50 + (over.compressor ? i : 0)],
  ...over,
});

describe('deriveEvents', () => {
  it('gives the same compressor runs as the thermal core, however the readings are split into batches', () => {
    const on = (i: number) => (i >= 3 && i < 9) || (i >= 20 && i < 22) || i >= 37;
    const series = Array.from({ length: 40 }, (_, i) => r(i, { compressor: on(i), powerW: on(i) ? 2000 : 0 }));
    const whole = deriveEvents(emptyDeriveState(), series);
    // In three batches, carrying the state between them.
    let state = emptyDeriveState();
    const seen = new Map<number, { endedAt: number | null }>();
    for (const part of [series.slice(0, 5), series.slice(5, 21), series.slice(21)]) {
      const out = deriveEvents(state, part);
      state = out.state;
      for (const e of out.events) if (e.kind === 'compressor_run') seen.set(e.startedAt, e);
    }
    const cycles = compressorCycles(series.map((x) => ({ t: x.ts, on: x.compressor === true })));
    const runs = whole.events.filter((e) => e.kind === 'compressor_run');
    expect(runs.map((e) => [e.startedAt, e.endedAt])).toEqual(
      cycles.runs.map((c) => [c.start, c.complete || c.end !== 39 * MIN ? c.end : null]),
    );
    expect([...seen.entries()].map(([s, e]) => [s, e.endedAt])).toEqual(runs.map((e) => [e.startedAt, e.endedAt]));
    // Energy: 2000 W for the 6 one-minute intervals of the first run is 200 Wh (2000 × 6 / 60; common practice arithmetic).
    expect(runs[0].energyWh).toBeCloseTo(200, 6);
    expect(state.open.compressor_run?.startedAt).toBe(37 * MIN);
  });

  it('closes open runs as incomplete across a gap in the readings', () => {
    const out = deriveEvents(emptyDeriveState(), [
      r(0, { immersionW: 3000 }),
      r(1, { immersionW: 3000 }),
      { ...r(1), ts: MIN + MAX_GAP_MS + 1, immersionW: 3000 },
    ]);
    const runs = out.events.filter((e) => e.kind === 'immersion_run');
    expect(runs[0]).toMatchObject({ startedAt: 0, endedAt: MIN, complete: false });
    expect(runs[1]).toMatchObject({ startedAt: MIN + MAX_GAP_MS + 1, endedAt: null });
  });

  it('refuses readings that are not newer than its state', () => {
    const { state } = deriveEvents(emptyDeriveState(), [r(5)]);
    expect(() => deriveEvents(state, [r(5)])).toThrow(/newer/);
  });
});
