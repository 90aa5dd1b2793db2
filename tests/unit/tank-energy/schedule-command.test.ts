import { describe, expect, it } from 'vitest';
import { scheduleWindows } from '../../../src/lib/tank-energy/schedule-command';
import { fmtMoney } from '../../../src/lib/tank-energy/present';

const w = (start: string, end: string, source: 'heat_pump' | 'immersion' = 'heat_pump') => ({ start, end, source });
const DEC = Date.parse('2026-12-01T22:00:00Z'); // GMT: London clock = UTC
const JUL = Date.parse('2026-07-01T22:00:00Z'); // BST: London clock = UTC + 1 h

describe('scheduleWindows', () => {
  it('folds a night charge onto the local clock (UK clocks: GMT in winter, BST = UTC+1 in summer, from memory)', () => {
    expect(scheduleWindows([w('2026-12-02T00:30:00Z', '2026-12-02T05:30:00Z')], DEC, 'Europe/London')).toEqual([
      { from: '00:30', to: '05:30' },
    ]);
    expect(scheduleWindows([w('2026-07-01T23:30:00Z', '2026-07-02T04:30:00Z')], JUL, 'Europe/London')).toEqual([
      { from: '00:30', to: '05:30' },
    ]);
  });

  it('merges sources and joins a window at the end of the day to one at its start', () => {
    const got = scheduleWindows(
      [
        w('2026-12-01T22:00:00Z', '2026-12-01T23:00:00Z'),
        w('2026-12-02T02:00:00Z', '2026-12-02T03:00:00Z', 'immersion'),
        w('2026-12-02T02:30:00Z', '2026-12-02T04:00:00Z'),
        w('2026-12-02T21:00:00Z', '2026-12-02T22:00:00Z'),
      ],
      DEC,
      'Europe/London',
    );
    expect(got).toEqual([
      { from: '02:00', to: '04:00' },
      { from: '21:00', to: '23:00' },
    ]);
  });

  it('keeps at most 6 windows by closing the shortest gaps first, and leaves out what starts after the first day', () => {
    // Seven 30-minute windows an hour and a half apart, except the 4th and 5th only 30 minutes apart.
    const starts = [0, 120, 240, 360, 420, 540, 660];
    const plan = starts.map((m) =>
      w(new Date(DEC + m * 60_000).toISOString(), new Date(DEC + (m + 30) * 60_000).toISOString()),
    );
    plan.push(w('2026-12-03T01:00:00Z', '2026-12-03T02:00:00Z'));
    const got = scheduleWindows(plan, DEC, 'Europe/London')!;
    expect(got).toHaveLength(6);
    expect(got[3]).toEqual({ from: '04:00', to: '05:30' });
  });

  it('answers null when the plan never heats, and [] (any time) when it heats all day', () => {
    expect(scheduleWindows([], DEC, 'Europe/London')).toBeNull();
    expect(scheduleWindows([w('2026-12-01T22:00:00Z', '2026-12-03T22:00:00Z')], DEC, 'Europe/London')).toEqual([]);
  });
});

describe('fmtMoney', () => {
  it('says pence under a pound and pounds from a pound', () => {
    expect(fmtMoney(44.6)).toBe('45p');
    expect(fmtMoney(320)).toBe('£3.20');
    expect(fmtMoney(-150)).toBe('−£1.50');
  });
});
