// The forms' checks are the API's own schemas on what the form would send: these pin that the
// browser refuses what the server refuses, at the field the user typed into.
import { describe, expect, it } from 'vitest';
import { thresholdChanges, thresholdOverridesSchema } from '@/lib/alerts/thresholds';
import { partsOf, visitBody, visitFormSchema, visitSchema } from '@/lib/commissioning/visit-form';
import { emptyTariffForm, tariffFormSchema, tariffOf } from '@/lib/energy/tariff-form';
import { parseTariff } from '@/lib/energy/tariff';
import { assumptionsSchema } from '@/lib/views/assumptions-form';

const paths = (r: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) =>
  (r.error?.issues ?? []).map((i) => i.path.join('.'));

describe('the tariff form', () => {
  const day = {
    ...emptyTariffForm('2027-01-01'),
    name: 'Test two-rate',
    dayImport: '27',
    nightImport: '9',
    export: '15',
  };

  it('turns what was typed into the tariff the API takes, priced from midnight at the home', () => {
    const t = tariffOf({ ...day, validTo: '2027-06-30' });
    // Europe/London is GMT in January and BST (UTC+1) in summer: IANA tz database (common practice).
    expect(t).toMatchObject({
      kind: 'day_night',
      dayImport: 27,
      nightImport: 9,
      validFrom: '2027-01-01T00:00:00.000Z',
      validTo: '2027-06-30T23:00:00.000Z',
    });
    expect(parseTariff(t).ok).toBe(true);
    expect(tariffFormSchema.safeParse(day).success).toBe(true);
  });

  it('names each refused field: a blank price, an impossible clock time, a last day before the first', () => {
    const r = tariffFormSchema.safeParse({ ...day, nightImport: '', nightStart: '25:00', validTo: '2026-12-01' });
    expect(paths(r).sort()).toEqual(['nightImport', 'nightStart', 'validTo']);
  });

  it('refuses text that is no number at the field, as the API does', () => {
    const r = tariffFormSchema.safeParse({ ...day, kind: 'flat', import: 'cheap' });
    expect(paths(r)).toEqual(['import']);
    expect(paths(r)).toEqual(
      (parseTariff(tariffOf({ ...day, kind: 'flat', import: 'cheap' })) as { errors: { field: string }[] }).errors.map(
        (e) => e.field,
      ),
    );
  });
});

describe('the thresholds form', () => {
  it('sends what differs from the defaults or was stored before, as numbers', () => {
    const typed = { shortCycleMinGapMin: '45', shortCycleMinRunMin: '10', offlineAfterMin: '' };
    const body = thresholdChanges(typed, { shortCycleMinRunMin: 12 });
    expect(body.shortCycleMinGapMin).toBe(45);
    expect(body.shortCycleMinRunMin).toBe(10);
    // A blank field is sent blank, so the schema names it rather than the default taking over silently.
    expect(body.offlineAfterMin).toBe('');
    expect(paths(thresholdOverridesSchema.safeParse(body))).toContain('offlineAfterMin');
  });

  it('leaves out values at their defaults that were never stored', () => {
    expect(thresholdChanges({ shortCycleMinGapMin: '60' }, {})).not.toHaveProperty('shortCycleMinGapMin');
  });
});

describe('the visit form', () => {
  it('reads parts as lines with an optional count', () => {
    expect(partsOf('2 × anode\n\n1x relief valve\ntundish')).toEqual([
      { quantity: 2, name: 'anode' },
      { quantity: 1, name: 'relief valve' },
      { quantity: 1, name: 'tundish' },
    ]);
  });

  it('refuses a reading as the API does, at the flat field the user typed into', () => {
    const typed = {
      kind: 'annual_inspection' as const,
      visitedAt: '2026-11-01',
      findings: 'Anode checked.',
      topC: 'hot',
    };
    expect(paths(visitFormSchema.safeParse(typed))).toEqual(['topC']);
    const body = visitBody(typed, {
      tankId: '00000000-0000-4000-8000-000000000001',
      resolvedAlertIds: [],
      uploadIds: [],
    });
    expect(paths(visitSchema.safeParse(body))).toEqual(['readings.topC']);
    expect(visitSchema.safeParse({ ...body, readings: { ...(body.readings as object), topC: '61' } }).success).toBe(
      true,
    );
  });
});

describe("the householder's shower and bath sizes", () => {
  // Bounds: a short shower to a large bath, litres at 40 °C (common practice).
  it('reads litres as typed, a decimal comma as a point', () => {
    expect(assumptionsSchema.parse({ showerL: ' 60 ', bathL: '120,5' })).toEqual({ showerL: 60, bathL: 120.5 });
  });
  it('refuses a size no shower or bath has, or no number at all, at its field', () => {
    const r = assumptionsSchema.safeParse({ showerL: '2', bathL: 'lots' });
    expect(r.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['showerL', 'A shower uses at least 5 litres here.'],
      ['bathL', 'Enter the litres per bath as a number, such as 80.'],
    ]);
    expect(paths(assumptionsSchema.safeParse({ showerL: '', bathL: '900' }))).toEqual(['showerL', 'bathL']);
  });
});
