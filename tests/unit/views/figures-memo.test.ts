import { describe, expect, it } from 'vitest';
import { memoFigures } from '../../../src/lib/views/figures-memo';
import { figuresOverTime, pointFigures } from '../../../src/lib/views/figures-over-time';

const tank = { volumeL: 200, heightM: 1, targetC: 55, sensorCount: 3 };
const MIN = 60_000;

// The bottom and top sensors warm by 0.02 K a minute while the middle one reads 40 °C throughout:
// the stuck check (0.05 K flat over 2 h while a neighbour moves 2 K, common practice) holds it stuck
// once its first window closes, so each reading's figures depend on the readings before it.
const reading = (i: number) => ({ t: i * MIN, layersC: [10 + 0.02 * i, 40, 50 + 0.02 * i] });
const rows = (from: number, to: number) => Array.from({ length: to - from }, (_, k) => reading(from + k));
const direct = (r: ReturnType<typeof rows>, t = tank) => figuresOverTime(r, t).map(pointFigures);

describe('figures worked out once per reading', () => {
  it('gives the thermal core figures the first time, then the same objects again without stepping anything twice', () => {
    const first = memoFigures('memo-a', rows(0, 200), tank);
    expect(first).toEqual(direct(rows(0, 200)));
    expect(first[150]?.quality).toEqual({ status: 'estimated', leftOut: [2] });
    const again = memoFigures('memo-a', rows(0, 200), tank);
    expect(again.every((f, i) => f === first[i])).toBe(true);
  });

  it('steps the carried check only over newer readings, agreeing with a run over the whole window', () => {
    const before = memoFigures('memo-b', rows(0, 100), tank);
    const later = memoFigures('memo-b', rows(30, 240), tank);
    expect(later).toEqual(direct(rows(0, 240)).slice(30));
    // Worked out from the later window alone the check would start again at minute 30.
    expect(later).not.toEqual(direct(rows(30, 240)));
    expect(later[0]).toBe(before[30]);
  });

  it('starts again for a reading that arrived late, a window reaching further back, or a new target', () => {
    memoFigures('memo-c', [...rows(0, 50), ...rows(51, 200)], tank);
    expect(memoFigures('memo-c', rows(0, 200), tank)).toEqual(direct(rows(0, 200)));
    memoFigures('memo-d', rows(100, 200), tank);
    expect(memoFigures('memo-d', rows(0, 200), tank)).toEqual(direct(rows(0, 200)));
    const hotter = { ...tank, targetC: 60 };
    const redone = memoFigures('memo-d', rows(0, 200), hotter);
    expect(redone).toEqual(direct(rows(0, 200), hotter));
    expect(redone[10]?.soc).not.toBe(direct(rows(0, 200))[10]?.soc);
  });
});
