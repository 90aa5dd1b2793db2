import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseHalfHourlyCsv, priceAt } from '../../../src/lib/energy/index.js';

const HEADER = 'start,end,import,export,unit';
const T0 = Date.UTC(2025, 0, 6);
const iso = (ms: number): string => new Date(ms).toISOString();
const slot = (i: number, imp = '14.2', exp = '4.1', unit = 'p/kWh'): string =>
  `${iso(T0 + i * 1_800_000)},${iso(T0 + (i + 1) * 1_800_000)},${imp},${exp},${unit}`;
const csv = (...lines: string[]): string => [HEADER, ...lines].join('\n');

function errorsOf(text: string, options = {}) {
  const r = parseHalfHourlyCsv(text, options);
  if (r.ok) throw new Error('expected the upload to be refused');
  return r.errors;
}

describe('parseHalfHourlyCsv', () => {
  it('accepts contiguous half hours, in any order, and prices each slot', () => {
    const r = parseHalfHourlyCsv(csv(slot(1, '30'), slot(0, '10', '5'), slot(2, '0.2', '0.05', '£/kWh')));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.tariff.validFromMs).toBe(T0);
    expect(r.tariff.validToMs).toBe(T0 + 3 * 1_800_000);
    expect(priceAt(r.tariff, T0 + 10 * 60_000)).toEqual({ importPence: 10, exportPence: 5 });
    expect(priceAt(r.tariff, T0 + 40 * 60_000)!.importPence).toBe(30);
    expect(priceAt(r.tariff, T0 + 61 * 60_000)!.importPence).toBeCloseTo(20, 10); // £0.20 = 20 p
    expect(priceAt(r.tariff, T0 + 90 * 60_000)).toBeNull();
  });

  it('refuses a gap, naming the line after it and the missing time', () => {
    const errors = errorsOf(csv(slot(0), slot(1), slot(3)));
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatchObject({ row: 4, field: 'start' });
    expect(errors[0]!.message).toMatch(
      /no prices from 2025-01-06T01:00:00Z to 2025-01-06T01:30:00Z, a gap of 30 minutes after line 3/,
    );
  });

  it('refuses an overlap and a duplicate slot, naming both lines', () => {
    const shifted = `${iso(T0 + 15 * 60_000)},${iso(T0 + 45 * 60_000)},12,4,p/kWh`;
    const errors = errorsOf(csv(slot(0), slot(0), slot(1)));
    expect(errors[0]).toMatchObject({ row: 3 });
    expect(errors[0]!.message).toMatch(/overlaps line 2/);
    const e2 = errorsOf(csv(slot(0), shifted));
    expect(e2.map((e) => e.row)).toEqual([3]);
    expect(e2[0]!.message).toMatch(/not on the hour or half hour/);
  });

  it('refuses slots that are not 30 minutes long', () => {
    const hour = `${iso(T0)},${iso(T0 + 3_600_000)},12,4,p/kWh`;
    const errors = errorsOf(csv(hour));
    expect(errors[0]).toMatchObject({ row: 2, field: 'end' });
    expect(errors[0]!.message).toMatch(/lasts 60 minutes; every slot must last 30 minutes/);
  });

  it('refuses bad units, absurd, negative and non-numeric prices, each with its line', () => {
    const errors = errorsOf(
      csv(
        slot(0, '14', '4', 'kWh'),
        slot(1, '14.2', '4', '£/kWh'),
        slot(2, '-3'),
        slot(3, 'twelve'),
        slot(4, '12', '-1'),
      ),
    );
    expect(errors.map((e) => [e.row, e.field])).toEqual([
      [2, 'unit'],
      [3, 'import'],
      [4, 'import'],
      [5, 'import'],
      [6, 'export'],
    ]);
    expect(errors[1]!.message).toMatch(/1420 p\/kWh, above the highest plausible 500 p\/kWh: check the unit/);
    expect(errors[2]!.message).toMatch(/negative/);
  });

  it('accepts negative import prices only when the tariff allows them', () => {
    expect(parseHalfHourlyCsv(csv(slot(0, '-3')), { negativeImportAllowed: true }).ok).toBe(true);
    expect(errorsOf(csv(slot(0, '-300')), { negativeImportAllowed: true })[0]!.message).toMatch(
      /below the lowest accepted -100/,
    );
  });

  it('refuses unparseable times and times without a zone', () => {
    const errors = errorsOf(
      csv(`yesterday,${iso(T0 + 1_800_000)},12,4,p/kWh`, `2025-01-06 00:30,2025-01-06 01:00,12,4,p/kWh`),
    );
    expect(errors.map((e) => [e.row, e.field])).toEqual([
      [2, 'start'],
      [3, 'start'],
      [3, 'end'],
    ]);
  });

  it('reports the header and short lines, and takes the unit from the caller when there is no unit column', () => {
    expect(errorsOf('start,end,price\n')[0]).toMatchObject({ row: 1, field: 'header' });
    expect(errorsOf(csv(`${iso(T0)},${iso(T0 + 1_800_000)},12`))[0]).toMatchObject({ row: 2, field: 'row' });
    expect(errorsOf('')[0]!.message).toMatch(/empty/);
    const noUnit = `start,end,import\n${iso(T0)},${iso(T0 + 1_800_000)},0.12`;
    expect(errorsOf(noUnit)[0]!.field).toBe('header');
    const r = parseHalfHourlyCsv(noUnit, { unit: '£/kWh' });
    expect(r.ok && r.tariff.importPence[0]).toBeCloseTo(12, 10);
  });

  it('counts lines as a spreadsheet does, skipping blank lines', () => {
    const errors = errorsOf([HEADER, slot(0), '', slot(1, 'x')].join('\n'));
    expect(errors[0]!.row).toBe(4);
  });

  it('is all or nothing: one bad row refuses the whole upload (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 60 }),
        fc.nat(),
        fc.array(fc.integer({ min: 0, max: 9000 }), { minLength: 60, maxLength: 60 }),
        (n, badSeed, cents) => {
          const lines = Array.from({ length: n }, (_, i) => slot(i, (cents[i]! / 100).toFixed(2)));
          const good = parseHalfHourlyCsv(csv(...lines));
          expect(good.ok).toBe(true);
          if (good.ok) expect(good.tariff.importPence.length).toBe(n);
          const bad = badSeed % n;
          lines[bad] = slot(bad, '9999');
          const r = parseHalfHourlyCsv(csv(...lines));
          expect(r.ok).toBe(false);
          if (!r.ok) expect(r.errors.map((e) => e.row)).toEqual([bad + 2]);
        },
      ),
      { numRuns: 50 },
    );
  });
});
