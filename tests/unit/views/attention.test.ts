import { describe, expect, it } from 'vitest';
import { alertKinds, alertLabels } from '../../../src/lib/alerts/types';
import { attentionKinds, attentionLabels, byUrgency, statusOf } from '../../../src/lib/views/attention';
import { rangeFromLink } from '../../../src/lib/views/contracts';
import { aroundEvidence, rangeSearch } from '../../../src/lib/views/range';

describe('what needs attention', () => {
  it('is every alert kind, named as the alert inbox names it', () => {
    expect([...attentionKinds].sort()).toEqual([...alertKinds].sort());
    for (const k of alertKinds) expect(attentionLabels[k]).toBe(alertLabels[k]);
  });
  it('orders problems for the desk: not reporting first, heat loss last', () => {
    expect(byUrgency(['heat_loss', 'low_hot_water', 'offline', 'sensor_fault', 'offline'])).toEqual([
      'offline',
      'sensor_fault',
      'low_hot_water',
      'heat_loss',
    ]);
  });
  it('gives a tank its status from its open alerts', () => {
    expect(statusOf([])).toBe('ok');
    expect(statusOf(['heat_loss'])).toBe('attention');
    expect(statusOf(['heat_loss', 'offline'])).toBe('offline');
  });
});

describe('a tank page opened from a link with ?from=&to=', () => {
  const q = (s: string) => rangeFromLink(new URLSearchParams(s));
  it('opens on the range the link gives', () => {
    expect(q('from=2026-03-01T07:00:00.000Z&to=2026-03-01T19:00:00.000Z')).toEqual({
      range: { from: Date.parse('2026-03-01T07:00:00Z'), to: Date.parse('2026-03-01T19:00:00Z') },
      problem: null,
    });
  });
  it('reads an offset whose plus sign arrived as a space', () => {
    expect(q('from=2026-03-01T08:00:00 01:00&to=2026-03-01T20:00:00%2B01:00').range).toEqual({
      from: Date.parse('2026-03-01T07:00:00Z'),
      to: Date.parse('2026-03-01T19:00:00Z'),
    });
  });
  it('opens on the default range, without a word, when the link gives none', () => {
    expect(q('')).toEqual({ range: null, problem: null });
    expect(q('tab=energy')).toEqual({ range: null, problem: null });
  });
  it('falls back to the default and says which field was wrong', () => {
    const bad: [string, RegExp][] = [
      ['from=yesterday&to=2026-03-01T19:00:00Z', /^The link's time range cannot be shown: from must be an ISO 8601/],
      ['from=2026-03-01T07:00:00Z', /to is missing/],
      ['to=2026-03-01T07:00:00Z', /from is missing/],
      ['from=2026-03-01T19:00:00Z&to=2026-03-01T07:00:00Z', /to must be after from/],
      ['from=2026-03-01T07:00:00Z&to=2026-03-01T07:00:00Z', /to must be after from/],
      ['from=2026-01-01T00:00:00Z&to=2026-03-05T00:00:00Z', /at most 62 days/],
      ['from=2026-03-01T07:00:00&to=2026-03-01T19:00:00Z', /from must be an ISO 8601 date-time with a time zone/],
    ];
    for (const [s, message] of bad) {
      const r = q(s);
      expect(r.range, s).toBeNull();
      expect(r.problem, s).toMatch(message);
    }
  });
  it('keeps a custom range in the address and drops it for a preset', () => {
    const custom = {
      preset: 'custom' as const,
      from: Date.parse('2026-03-01T07:00:00Z'),
      to: Date.parse('2026-03-01T19:00:00Z'),
    };
    expect(rangeSearch(custom, '?from=x&to=y&tab=energy')).toBe(
      '?tab=energy&from=2026-03-01T07%3A00%3A00.000Z&to=2026-03-01T19%3A00%3A00.000Z',
    );
    expect(rangeFromLink(new URLSearchParams(rangeSearch(custom, ''))).range).toEqual({
      from: custom.from,
      to: custom.to,
    });
    expect(rangeSearch({ preset: '7d' }, '?from=x&to=y')).toBe('');
  });
  it('opens an alert six hours either side of its evidence, as alert links do', () => {
    const at = Date.parse('2026-03-01T13:00:00Z');
    expect(aroundEvidence(at)).toEqual({
      from: Date.parse('2026-03-01T07:00:00Z'),
      to: Date.parse('2026-03-01T19:00:00Z'),
    });
  });
});
