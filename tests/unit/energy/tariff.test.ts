import { describe, expect, it } from 'vitest';
import { EnergyInputError, importPriceSeries, parseTariff, priceAt } from '../../../src/lib/energy/index.js';
import type { Tariff } from '../../../src/lib/energy/index.js';

const flatInput = { kind: 'flat', unit: 'p/kWh', import: 24.5, export: 15, validFrom: '2025-01-01T00:00:00Z' };

function ok(input: unknown): Tariff {
  const r = parseTariff(input);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.tariff;
}

describe('parseTariff', () => {
  it('keeps a flat tariff in p/kWh as entered', () => {
    const t = ok(flatInput);
    expect(t).toMatchObject({
      kind: 'flat',
      importPence: 24.5,
      exportPence: 15,
      validFromMs: Date.UTC(2025, 0, 1),
      validToMs: null,
    });
  });

  it('converts pounds per kWh to pence (100 p = £1, common practice)', () => {
    const t = ok({ ...flatInput, unit: '£/kWh', import: 0.245, export: 0.15 });
    expect(t.kind === 'flat' && t.importPence).toBeCloseTo(24.5, 10);
    expect(t.kind === 'flat' && t.exportPence).toBeCloseTo(15, 10);
  });

  it('refuses an unknown unit, naming the field', () => {
    const r = parseTariff({ ...flatInput, unit: 'c/kWh' });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.errors[0]!.field).toBe('unit');
  });

  it('refuses pence entered as pounds as implausible, suggesting the unit', () => {
    const r = parseTariff({ ...flatInput, unit: '£/kWh', import: 24.5 });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.errors[0]).toMatchObject({ field: 'import' });
    expect(!r.ok && r.errors[0]!.message).toMatch(/check the unit/);
  });

  it('refuses negative prices and a validity that ends before it starts', () => {
    const r = parseTariff({ ...flatInput, export: -1, validTo: '2024-12-31T00:00:00Z' });
    expect(!r.ok && r.errors.map((e) => e.field).sort()).toEqual(['export', 'validTo']);
  });

  it('refuses a time without a zone and a half-hourly tariff sent as a form', () => {
    expect(parseTariff({ ...flatInput, validFrom: '2025-01-01 00:00' }).ok).toBe(false);
    const r = parseTariff({ kind: 'half_hourly' });
    expect(!r.ok && r.errors[0]!.field).toBe('kind');
  });

  it('refuses an unknown time zone for a day/night tariff', () => {
    const r = parseTariff({
      kind: 'day_night',
      unit: 'p/kWh',
      validFrom: '2025-01-01T00:00:00Z',
      timeZone: 'Wendmoor/Ashby',
      nightStart: '00:30',
      nightEnd: '07:30',
      dayImport: 28,
      nightImport: 9,
    });
    expect(!r.ok && r.errors[0]!.field).toBe('timeZone');
  });
});

describe('priceAt', () => {
  const dayNight = ok({
    kind: 'day_night',
    unit: 'p/kWh',
    validFrom: '2025-01-01T00:00:00Z',
    timeZone: 'Europe/London',
    nightStart: '00:30',
    nightEnd: '07:30',
    dayImport: 28,
    nightImport: 9,
    export: 4,
  });

  it('follows the local clock of a day/night tariff in winter (UTC = GMT) and summer (BST = UTC+1; UK clock rules)', () => {
    expect(priceAt(dayNight, Date.UTC(2025, 0, 15, 0, 29))!.importPence).toBe(28);
    expect(priceAt(dayNight, Date.UTC(2025, 0, 15, 0, 30))!.importPence).toBe(9);
    expect(priceAt(dayNight, Date.UTC(2025, 0, 15, 7, 29))!.importPence).toBe(9);
    expect(priceAt(dayNight, Date.UTC(2025, 0, 15, 7, 30))!.importPence).toBe(28);
    // 15 July: 23:30 UTC is 00:30 BST (night); 06:30 UTC is 07:30 BST (day).
    expect(priceAt(dayNight, Date.UTC(2025, 6, 14, 23, 30))!.importPence).toBe(9);
    expect(priceAt(dayNight, Date.UTC(2025, 6, 15, 6, 30))!.importPence).toBe(28);
    expect(priceAt(dayNight, Date.UTC(2025, 6, 15, 6, 30))!.exportPence).toBe(4);
  });

  it('handles a night window that spans midnight', () => {
    const t = ok({
      kind: 'day_night',
      unit: 'p/kWh',
      validFrom: '2025-01-01T00:00:00Z',
      nightStart: '23:00',
      nightEnd: '06:00',
      dayImport: 30,
      nightImport: 10,
    });
    expect(priceAt(t, Date.UTC(2025, 0, 15, 23, 0))!.importPence).toBe(10);
    expect(priceAt(t, Date.UTC(2025, 0, 15, 5, 59))!.importPence).toBe(10);
    expect(priceAt(t, Date.UTC(2025, 0, 15, 12, 0))!.importPence).toBe(30);
  });

  it('gives null outside the validity and lets the latest-starting tariff in force win', () => {
    const old = ok({ ...flatInput, import: 30 });
    const newer = ok({ ...flatInput, import: 20, validFrom: '2025-03-01T00:00:00Z', validTo: '2025-04-01T00:00:00Z' });
    expect(priceAt(old, Date.UTC(2024, 11, 31))).toBeNull();
    expect(priceAt([newer, old], Date.UTC(2025, 1, 1))!.importPence).toBe(30);
    expect(priceAt([newer, old], Date.UTC(2025, 2, 15))!.importPence).toBe(20);
    expect(priceAt([old, newer], Date.UTC(2025, 3, 1))!.importPence).toBe(30);
  });

  it('prices by the first layer with a tariff in force: a home’s own for its period, the default around it', () => {
    const companyDefault = ok({ ...flatInput, import: 30 });
    const homeOwn = ok({
      ...flatInput,
      import: 12,
      validFrom: '2025-03-01T00:00:00Z',
      validTo: '2025-04-01T00:00:00Z',
    });
    const layered = { layers: [[homeOwn], [companyDefault]] };
    expect(priceAt(layered, Date.UTC(2025, 1, 28, 23, 59))!.importPence).toBe(30);
    expect(priceAt(layered, Date.UTC(2025, 2, 1))!.importPence).toBe(12);
    expect(priceAt(layered, Date.UTC(2025, 2, 31, 23, 59))!.importPence).toBe(12);
    expect(priceAt(layered, Date.UTC(2025, 3, 1))!.importPence).toBe(30);
    // An older home tariff still overrides a newer default while it is in force.
    const newerDefault = ok({ ...flatInput, import: 40, validFrom: '2025-03-15T00:00:00Z' });
    expect(priceAt({ layers: [[homeOwn], [companyDefault, newerDefault]] }, Date.UTC(2025, 2, 20))!.importPence).toBe(
      12,
    );
    expect(priceAt({ layers: [[], []] }, Date.UTC(2025, 2, 20))).toBeNull();
  });

  it('builds a planner price series and names the first unpriced step', () => {
    const t = ok({ ...flatInput, validTo: '2025-01-02T00:00:00Z' });
    expect(importPriceSeries(t, Date.UTC(2025, 0, 1, 22), 4)).toEqual([24.5, 24.5, 24.5, 24.5]);
    try {
      importPriceSeries(t, Date.UTC(2025, 0, 1, 23), 4);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EnergyInputError);
      expect((e as EnergyInputError).field).toBe('prices[2]');
    }
  });
});
