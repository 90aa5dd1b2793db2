import { describe, expect, it } from 'vitest';
import { rangeQuerySchema } from '../../../src/lib/views/contracts';
import { type SeriesRow, toSeries } from '../../../src/lib/views/series';
import { mergeSeries } from '../../../src/lib/views/series-merge';

const tank = { id: 't1', volumeL: 200, heightM: 1, targetC: 55, sensorCount: 3, positionsM: [1 / 6, 0.5, 5 / 6] };
const MIN = 60_000;

// Four hours at one reading a minute: the bottom and top sensors warm by 0.02 K a minute (2.4 K in
// the stuck check's 2-hour window) while the middle one reads exactly 40 °C throughout, so the check
// holds it stuck once its first window closes (limits: 0.05 K flat while a neighbour moves 2 K,
// common practice) and the figures leave it out from then on.
const rows: SeriesRow[] = Array.from({ length: 240 }, (_, i) => ({
  t: i * MIN,
  layersC: [10 + 0.02 * i, 40, 50 + 0.02 * i],
  compressor: 0,
  immersion: 0,
  drawLpm: null,
  flowC: null,
}));
const window = (from: number, to: number) => rows.filter((r) => r.t >= from && r.t < to);

describe('a live window polled from its newest point', () => {
  it('sends only the points since the cursor, their figures worked out over the whole range', () => {
    const meta = { from: new Date(0), to: new Date(240 * MIN), resolution: 'raw' as const };
    const full = toSeries(rows, tank, meta);
    const poll = toSeries(rows, tank, { ...meta, since: new Date(200 * MIN) });
    expect(poll.t).toEqual(full.t.slice(200));
    expect(poll.soc).toEqual(full.soc.slice(200));
    expect(poll.v40L).toEqual(full.v40L.slice(200));
    expect(poll.qualityAt).toEqual(full.qualityAt.slice(200));
    // Worked out over the last 40 minutes alone, no window of the check would have closed.
    expect(poll.qualityAt[0]).toEqual({ status: 'estimated', leftOut: [2] });
    expect(toSeries(window(200 * MIN, 240 * MIN), tank, { ...meta, from: new Date(200 * MIN) }).qualityAt[0]).toEqual({
      status: 'measured',
    });
    expect(poll.quality).toEqual({
      status: 'estimated',
      leftOut: [2],
      reason: 'Estimated, sensor 2 left out (in every reading used).',
    });
  });

  it('merges a poll into the window it came from exactly as a full fetch would answer', () => {
    const meta = { from: new Date(0), resolution: 'raw' as const };
    const before = toSeries(window(0, 200 * MIN), tank, { ...meta, to: new Date(200 * MIN) });
    const full = toSeries(rows, tank, { ...meta, to: new Date(240 * MIN) });
    const poll = toSeries(rows, tank, { ...meta, to: new Date(240 * MIN), since: new Date(before.t.at(-1)!) });
    expect(poll.t).toHaveLength(41);
    const merged = mergeSeries(before, poll, 0);
    expect(merged).toEqual(full);
    expect(merged.quality).toEqual({
      status: 'estimated',
      leftOut: [2],
      reason: 'Estimated, sensor 2 left out (in 120 of 240 readings used).',
    });
  });

  it('drops the points that slid out of the window and replaces the newest, which a rollup may still be filling', () => {
    const prev = toSeries(window(0, 120 * MIN), tank, {
      from: new Date(0),
      to: new Date(120 * MIN),
      resolution: 'raw',
    });
    const poll = toSeries(window(30 * MIN, 150 * MIN), tank, {
      from: new Date(30 * MIN),
      to: new Date(150 * MIN),
      resolution: 'raw',
      since: new Date(119 * MIN),
    });
    const merged = mergeSeries(prev, poll, 30 * MIN);
    expect(merged.t).toEqual(Array.from({ length: 120 }, (_, i) => (30 + i) * MIN));
    expect(merged.layers.map((l) => l.length)).toEqual([120, 120, 120]);
    expect(merged.layers[2]![89]).toBe(poll.layers[2]![0]);
    expect(merged.from).toBe(new Date(30 * MIN).toISOString());
  });

  it('refuses a cursor outside the range, naming it', () => {
    const r = rangeQuerySchema.safeParse({
      from: '2026-03-01T00:00:00Z',
      to: '2026-03-02T00:00:00Z',
      since: '2026-03-02T00:00:00Z',
    });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual(['since']);
    expect(
      rangeQuerySchema.parse({ from: '2026-03-01T00:00:00Z', to: '2026-03-02T00:00:00Z' }).since.toISOString(),
    ).toBe('2026-03-01T00:00:00.000Z');
  });
});
