import { describe, expect, it } from 'vitest';
import { analyseTank, quietPeriods } from '../../../src/lib/views/analysis';
import { rangeQuerySchema, tanksQuerySchema } from '../../../src/lib/views/contracts';
import { readingsCsv } from '../../../src/lib/views/csv';
import { litreBins, shareBins } from '../../../src/lib/views/distribution';
import { customRangeSchema } from '../../../src/lib/views/range-form';
import { cellSpans, columnAt, nearestIndex, rawToRow, toSeries, type SeriesRow } from '../../../src/lib/views/series';
import { markShortCycles, timelineBars } from '../../../src/lib/views/timeline';
import { waterCp, waterDensity } from '../../../src/lib/thermal';

const tank = { id: 't1', volumeL: 200, heightM: 1, targetC: 55, sensorCount: 3, positionsM: [1 / 6, 0.5, 5 / 6] };

describe('series for the charts', () => {
  it('turns readings into columns with state of charge and V40 per point, estimated where a sensor is left out, null where withheld', () => {
    const rows = [
      rawToRow({
        ts: new Date(0),
        layersCc: [1000, 4000, 5500],
        compressor: true,
        immersionW: 0,
        drawDlpm: 60,
        flowCc: 6000,
      }),
      rawToRow({
        ts: new Date(60_000),
        layersCc: [1000, null, 5500],
        compressor: false,
        immersionW: 3000,
        drawDlpm: null,
        flowCc: null,
      }),
      rawToRow({
        ts: new Date(120_000),
        layersCc: [1000, 4000, null],
        compressor: false,
        immersionW: 0,
        drawDlpm: null,
        flowCc: null,
      }),
    ];
    const s = toSeries(rows, tank, { from: new Date(0), to: new Date(180_000), resolution: 'raw' });
    expect(s.layers).toEqual([
      [10, 10, 10],
      [40, null, 40],
      [55, 55, null],
    ]);
    // V40 (EN 16147): top third 55 °C → 66.67 L·45/30 = 100 L; the 40 °C layer adds 66.67 L.
    expect(s.v40L[0]).toBeCloseTo(166.7, 1);
    // Sensor 2 left out and estimated half-way by height, (10 + 55)/2 = 32.5 °C, below 40 °C: the top third only (common practice: linear by height).
    expect(s.v40L[1]).toBeCloseTo(100, 1);
    // The top sensor out: withheld, never a guess.
    expect([s.v40L[2], s.soc[2]]).toEqual([null, null]);
    expect(s.quality).toEqual({
      status: 'estimated',
      leftOut: [2],
      reason: 'Estimated, sensor 2 left out (in 1 of 2 readings used).',
    });
    expect(s.compressor).toEqual([1, 0, 0]);
    expect(s.immersion).toEqual([0, 1, 0]);
    expect(s.drawLpm).toEqual([6, null, null]);
    expect(columnAt(s, 0).map((c) => c.tempC)).toEqual([55, 40, 10]);
  });
  it('finds the nearest reading and the time each heatmap cell spans', () => {
    expect(nearestIndex([0, 10, 20], 14)).toBe(1);
    expect(nearestIndex([0, 10, 20], 16)).toBe(2);
    expect(nearestIndex([], 1)).toBe(-1);
    expect(cellSpans([0, 10, 100], 20)).toEqual([
      { from: -10, to: 5 },
      { from: 5, to: 20 },
      { from: 90, to: 110 },
    ]);
  });
  it('writes the CSV with a header and one row per point', () => {
    const rows = [
      rawToRow({
        ts: new Date(0),
        layersCc: [1000, 4000, 5500],
        compressor: true,
        immersionW: 0,
        drawDlpm: 60,
        flowCc: 6000,
      }),
    ];
    const csv = readingsCsv(
      toSeries(rows, tank, { from: new Date(0), to: new Date(60_000), resolution: 'raw' }),
      'KVC210-1',
    );
    const lines = csv.trim().split('\r\n');
    expect(lines[1]).toBe(
      'time_utc,layer_1_c,layer_2_c,layer_3_c,state_of_charge,v40_l,compressor_on,immersion_on,draw_l_per_min,flow_c',
    );
    expect(lines[2]).toMatch(/^1970-01-01T00:00:00.000Z,10.00,40.00,55.00,0.\d{4},166.7,1.000,0.000,6.0,60.00$/);
  });
});

describe('timeline', () => {
  const at = (m: number) => new Date(Date.UTC(2026, 2, 1, 0, m));
  const run = (m: number) => ({
    kind: 'compressor_run' as const,
    startedAt: at(m),
    endedAt: at(m + 20),
    energyWh: 500,
    litres: 0,
    complete: true,
  });
  it('marks a compressor start less than 60 min after the previous one, including one before the range', () => {
    const items = markShortCycles([run(30), run(120), run(150)], 60, at(0));
    expect(items.map((i) => i.shortCycle)).toEqual([true, false, true]);
    expect(markShortCycles([run(30)], 60, null)[0]!.shortCycle).toBe(false);
  });
  it('clips bars to the range and ends an open run now', () => {
    const bars = timelineBars(
      [
        {
          kind: 'immersion_run',
          startedAt: at(0).toISOString(),
          endedAt: null,
          energyWh: 0,
          litres: null,
          complete: false,
          shortCycle: false,
        },
      ],
      at(10).getTime(),
      at(100).getTime(),
      at(50).getTime(),
    );
    expect(bars[0]).toMatchObject({ from: at(10).getTime(), to: at(50).getTime() });
  });
});

describe('standing loss and legionella from a week of readings', () => {
  it('recovers UA from a Newton cooling curve in a quiet period', () => {
    // T(t) = 20 + (60 − 20)·e^(−t·UA/(m·c)) with UA = 1.5 W/K (Newton's law of cooling).
    const ua = 1.5;
    const mc = 0.2 * waterDensity(50) * waterCp(50);
    const rows: SeriesRow[] = [];
    for (let m = 0; m <= 8 * 60; m++) {
      const c = 20 + 40 * Math.exp((-m * 60 * ua) / mc);
      rows.push({ t: m * 60_000, layersC: [c, c, c], compressor: 0, immersion: 0, drawLpm: 0, flowC: null });
    }
    rows.push({ t: 481 * 60_000, layersC: [30, 40, 50], compressor: 1, immersion: 0, drawLpm: 0, flowC: null });
    expect(quietPeriods(rows)).toHaveLength(1);
    const a = analyseTank(rows, { ...tank, declaredLossW: 57 }, { from: new Date(0), to: new Date(482 * 60_000) });
    // The fit uses water properties at the period's mean temperature, a little off 50 °C: within 3 %.
    expect(a.standingLoss!.uaWPerK).toBeCloseTo(ua, 1);
    expect(a.standingLoss!.lossWAt45K).toBeCloseTo(45 * ua, 0);
    // 812/2013 Annex II: class A when S < 8.5 + 4.25·200^0.4 = 41.0 W; 67.5 W is below C's 16.66 + 8.33·V^0.4 = 80.0 W.
    expect(a.standingLoss!.impliedClass).toBe('C');
    // Water that starts at 60 °C and cools at once never holds 60 °C between two readings.
    expect(a.legionella!.minutesAtOrAbove).toEqual([0, 0, 0]);
    expect(a.legionella!.heldFraction).toBe(0);
  });
  it('says why when there is no quiet period', () => {
    const rows: SeriesRow[] = [0, 1, 2].map((m) => ({
      t: m * 60_000,
      layersC: [50, 50, 50],
      compressor: 1,
      immersion: 0,
      drawLpm: 0,
      flowC: null,
    }));
    const a = analyseTank(rows, { ...tank, declaredLossW: null }, { from: new Date(0), to: new Date(180_000) });
    expect(a.standingLoss).toBeNull();
    expect(a.standingLossNote).toMatch(/No quiet stretch/);
  });
});

describe('query strings', () => {
  it('names the bad field', () => {
    const r = tanksQuerySchema.safeParse({ pageSize: '500' });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.path).toEqual(['pageSize']);
    expect(tanksQuerySchema.safeParse({ colour: 'red' }).error!.issues[0]!.message).toMatch(/colour/);
    expect(tanksQuerySchema.parse({})).toMatchObject({ page: 1, pageSize: 25, sort: 'attention' });
  });
  it('chooses raw for a day, 15-minute rollups for a week and hourly for a month, and refuses raw for 30 days', () => {
    const to = '2026-03-31T00:00:00Z';
    expect(rangeQuerySchema.parse({ from: '2026-03-30T00:00:00Z', to }).resolution).toBe('raw');
    expect(rangeQuerySchema.parse({ from: '2026-03-24T00:00:00Z', to }).resolution).toBe('15m');
    expect(rangeQuerySchema.parse({ from: '2026-03-01T00:00:00Z', to }).resolution).toBe('1h');
    expect(
      rangeQuerySchema.safeParse({ from: '2026-03-01T00:00:00Z', to, resolution: 'raw' }).error!.issues[0]!.path,
    ).toEqual(['resolution']);
    expect(rangeQuerySchema.safeParse({ from: to, to: '2026-03-01T00:00:00Z' }).error!.issues[0]!.path).toEqual(['to']);
    expect(rangeQuerySchema.safeParse({ from: 'yesterday' }).error!.issues[0]!.path).toEqual(['from']);
  });
  it('checks a custom range, naming the field', () => {
    const issues = (from: string, to: string) =>
      customRangeSchema.safeParse({ from, to }).error?.issues.map((i) => [i.path.join('.'), i.message]);
    expect(issues('2026-03-01T10:00', '2026-03-01T09:00')).toEqual([['to', 'The end must be after the start.']]);
    expect(issues('', '2026-03-01T09:00')).toEqual([['from', 'Enter a start date and time.']]);
    expect(issues('2026-01-01T00:00', '2026-03-05T00:00')).toEqual([['to', 'Choose at most 62 days.']]);
    expect(customRangeSchema.parse({ from: '2026-03-01T10:00Z', to: '2026-03-01T12:00Z' })).toEqual({
      from: Date.UTC(2026, 2, 1, 10),
      to: Date.UTC(2026, 2, 1, 12),
    });
  });
});

describe('distributions', () => {
  it('bins state of charge in tenths and V40 in 50 L steps', () => {
    expect(shareBins([0, 0.05, 0.1, 0.99, 1, null])).toEqual([2, 1, 0, 0, 0, 0, 0, 0, 0, 2]);
    expect(litreBins([0, 49, 50, 400], 50, 3).map((b) => b.count)).toEqual([2, 1, 1]);
  });
});
