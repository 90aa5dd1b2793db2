import { describe, expect, it } from 'vitest';
import { attentionFor, sensorFaultIn, statusOf, type AttentionFacts } from '../../../src/lib/views/attention';

const now = Date.parse('2026-03-02T12:00:00Z');
const healthy: AttentionFacts = {
  lastSeenAt: new Date(now - 60_000), online: true, layersC: [20, 30, 45, 55, 58, 60], v40L: 120, hasHeatPump: true,
  compressorStarts: [], topHeldHours: 5, immersionWh: 0, compressorWh: 2000,
};

describe('attention rules', () => {
  it('finds nothing wrong with a healthy tank', () => {
    expect(attentionFor(healthy, now)).toEqual([]);
    expect(statusOf([])).toBe('ok');
  });
  it('calls a tank offline after 30 minutes of silence (common practice) or when its last will says so', () => {
    expect(attentionFor({ ...healthy, lastSeenAt: new Date(now - 29 * 60_000) }, now)).toEqual([]);
    expect(attentionFor({ ...healthy, lastSeenAt: new Date(now - 31 * 60_000) }, now)).toEqual(['offline']);
    expect(attentionFor({ ...healthy, online: false }, now)).toEqual(['offline']);
    expect(statusOf(['offline', 'low_hot_water'])).toBe('offline');
  });
  it('sees a missing sensor, an impossible value and an inversion', () => {
    expect(sensorFaultIn([20, null, 50])).toMatch(/Sensor 2/);
    expect(sensorFaultIn([20, 140, 50])).toMatch(/140\.0 °C/);
    // Hot water cannot sit under cold: 5 K of inversion is the limit (common practice).
    expect(sensorFaultIn([20, 50, 44.9])).toMatch(/swapped/);
    expect(sensorFaultIn([20, 50, 45])).toBeNull();
  });
  it('flags two compressor starts less than 60 min apart (common practice), not 60 min apart', () => {
    const t0 = now - 3 * 3_600_000;
    expect(attentionFor({ ...healthy, compressorStarts: [t0, t0 + 60 * 60_000] }, now)).toEqual([]);
    expect(attentionFor({ ...healthy, compressorStarts: [t0, t0 + 59 * 60_000] }, now)).toEqual(['short_cycling']);
    expect(attentionFor({ ...healthy, hasHeatPump: false, compressorStarts: [t0, t0 + 10 * 60_000] }, now)).toEqual([]);
  });
  it('flags V40 below 65 L, the minimum Regulation (EU) No 814/2013 sets for load profile M', () => {
    expect(attentionFor({ ...healthy, v40L: 65 }, now)).toEqual([]);
    expect(attentionFor({ ...healthy, v40L: 64.9 }, now)).toEqual(['low_hot_water']);
  });
  it('flags a week without one hour at 60 °C at the top (HSE HSG274 Part 2), but not without data', () => {
    expect(attentionFor({ ...healthy, topHeldHours: 0 }, now)).toEqual(['legionella_risk']);
    expect(attentionFor({ ...healthy, topHeldHours: null }, now)).toEqual([]);
  });
  it('flags an immersion using more than 30 % of the electricity beside a heat pump (common practice)', () => {
    expect(attentionFor({ ...healthy, immersionWh: 310, compressorWh: 690 }, now)).toEqual(['immersion_heavy']);
    expect(attentionFor({ ...healthy, immersionWh: 300, compressorWh: 700 }, now)).toEqual([]);
  });
  it('lists problems most urgent first', () => {
    expect(attentionFor({ ...healthy, online: false, v40L: 10, layersC: [20, null] }, now)).toEqual(['offline', 'sensor_fault', 'low_hot_water']);
  });
});
