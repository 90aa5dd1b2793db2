import { describe, expect, it } from 'vitest';
import { parseTelemetry, parseTopic, topicFor, limits } from '../../../src/lib/telemetry/wire';

const now = Date.parse('2026-03-01T12:00:00Z');
const ctx = { now, tank: { serial: 'KVC210-100001', sensorCount: 4 }, retentionDays: 90 };
const ok = (over: object = {}) => ({ ts: '2026-03-01T11:59:00Z', layersC: [20, 30, 40, 50], ...over });

describe('parseTelemetry', () => {
  it('accepts ISO 8601 with a zone and epoch milliseconds as the same instant', () => {
    const a = parseTelemetry(JSON.stringify(ok()), ctx);
    const b = parseTelemetry(JSON.stringify(ok({ ts: now - 60_000 })), ctx);
    expect(a.ok && a.readings[0].ts).toBe(now - 60_000);
    expect(b.ok && b.readings[0].ts).toBe(now - 60_000);
  });

  it('refuses a time without a zone (ISO 8601 local time is ambiguous; common practice)', () => {
    const r = parseTelemetry(JSON.stringify(ok({ ts: '2026-03-01T11:59:00' })), ctx);
    expect(r.ok && r.rejected[0].fields[0].field).toBe('ts');
  });

  it('keeps null for a sensor the device reports open, and ignores unknown fields', () => {
    const r = parseTelemetry(JSON.stringify(ok({ layersC: [20, null, 40, 50], firmware: '2.1' })), ctx);
    expect(r.ok && r.readings[0]).toEqual({ ts: now - 60_000, layersC: [20, null, 40, 50] });
  });

  it('allows a device clock 5 minutes ahead but not more (common practice)', () => {
    const ahead = (ms: number) => parseTelemetry(JSON.stringify(ok({ ts: now + ms })), ctx);
    expect(
      ahead(limits.futureSkewMs).ok && (ahead(limits.futureSkewMs) as { readings: unknown[] }).readings,
    ).toHaveLength(1);
    const r = ahead(limits.futureSkewMs + 1);
    expect(r.ok && r.rejected[0].code).toBe('TimestampInFuture');
  });

  it('judges each reading of a batch on its own', () => {
    const r = parseTelemetry(
      JSON.stringify({ readings: [ok(), ok({ layersC: [20, 30] }), ok({ ts: now - 120_000, pumpPct: 101 })] }),
      ctx,
    );
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.readings).toHaveLength(1);
    expect(r.rejected.map((x) => [x.index, x.code, x.fields[0].field])).toEqual([
      [1, 'LayerCountMismatch', 'readings[1].layersC'],
      [2, 'InvalidReading', 'readings[2].pumpPct'],
    ]);
  });

  it('carries solarSurplusW through, and refuses a negative, absurd or non-numeric one naming the field', () => {
    const good = parseTelemetry(JSON.stringify(ok({ solarSurplusW: 1850 })), ctx);
    expect(good.ok && good.readings[0]!.solarSurplusW).toBe(1850);
    // Surplus is power beyond the household's use before diversion: never below zero. Bounded like the
    // other power fields (a home's own supply fits well inside 30 kW; common practice).
    for (const [bad, message] of [
      [-1, /at least 0 W/],
      [limits.maxPowerW + 1, /at most 30000 W/],
      ['1850', /must be a number/],
      [null, /must be a number/],
    ] as const) {
      const r = parseTelemetry(JSON.stringify(ok({ solarSurplusW: bad })), ctx);
      expect(r.ok).toBe(true);
      if (!r.ok) continue;
      expect(r.readings).toHaveLength(0);
      expect(r.rejected[0]).toMatchObject({
        code: 'InvalidReading',
        fields: [{ field: 'solarSurplusW', message: expect.stringMatching(message) }],
      });
    }
    const inBatch = parseTelemetry(
      JSON.stringify({ readings: [ok(), ok({ ts: now - 120_000, solarSurplusW: -5 })] }),
      ctx,
    );
    expect(inBatch.ok && inBatch.rejected.map((x) => x.fields[0]!.field)).toEqual(['readings[1].solarSurplusW']);
  });

  it('refuses the whole payload when it is too large', () => {
    const big = 'x'.repeat(limits.maxPayloadBytes + 1);
    expect(parseTelemetry(big, ctx)).toMatchObject({ ok: false, code: 'PayloadTooLarge' });
  });
});

describe('topics', () => {
  it('round-trip and reject foreign shapes', () => {
    expect(parseTopic(topicFor('KVC210-100001', 'telemetry'))).toEqual({
      serial: 'KVC210-100001',
      channel: 'telemetry',
    });
    expect(parseTopic('heatlayer/v1/tanks/+/telemetry')).toBeNull();
    expect(parseTopic('heatlayer/v1/tanks/A/other')).toBeNull();
    expect(parseTopic('heatlayer/v2/tanks/A/telemetry')).toBeNull();
  });
});

describe('docs/wire-contract.schema.json', () => {
  it('is what the zod schemas generate (regenerate it when the contract changes)', async () => {
    const { readFileSync } = await import('node:fs');
    const { wireJsonSchema } = await import('../../../src/lib/telemetry/json-schema');
    const committed = JSON.parse(
      readFileSync(new URL('../../../docs/wire-contract.schema.json', import.meta.url), 'utf8'),
    );
    expect(committed).toEqual(JSON.parse(JSON.stringify(wireJsonSchema())));
  });
});
