// The one list of heat sources: every place that names the kinds reads it, and each kind's
// capabilities steer the commissioning steps, the exchanger check and the planner.
import { describe, expect, it } from 'vitest';
import { heatSourceEnum } from '../../../src/db/schema/homes';
import {
  capabilities,
  hasHeatPump,
  heatPumpKinds,
  heatSourceDescriptions,
  heatSourceKinds,
  heatSourceLabels,
  isHeatSource,
} from '../../../src/lib/heat-sources';
import { exchangerProblem, exchangers, heatSourceStepSchema } from '../../../src/lib/commissioning/steps';
import { heatSourceValues } from '../../../src/lib/views/labels';
import { PlanRefusal, planInput, type PlanFacts } from '../../../src/lib/tank-energy/plan';

describe('heat sources', () => {
  it('gives the database enum, the fleet filter and the labels the same kinds', () => {
    expect(heatSourceEnum.enumValues).toEqual([...heatSourceKinds]);
    expect(heatSourceValues).toEqual(heatSourceKinds);
    for (const k of heatSourceKinds) {
      expect(heatSourceLabels[k]).toMatch(/\w/);
      expect(heatSourceDescriptions[k]).toMatch(/\w/);
      expect(isHeatSource(k)).toBe(true);
    }
    expect(isHeatSource('solar_thermal')).toBe(false);
  });

  it('says which kinds have a heat pump, a boiler, an immersion as the only heater', () => {
    expect(heatPumpKinds).toEqual(['hp_plate', 'hp_coil']);
    expect(heatSourceKinds.filter((k) => capabilities(k).boiler)).toEqual(['boiler_coil']);
    expect(heatSourceKinds.filter((k) => capabilities(k).immersion === 'only')).toEqual(['immersion_only']);
    expect(heatSourceKinds.filter((k) => !capabilities(k).electricMain)).toEqual(['boiler_coil']);
    expect(() => capabilities('solar_thermal' as never)).toThrow(/heatSource is solar_thermal/);
  });

  it('asks for the heat pump’s sensor input only where there is a heat pump', () => {
    for (const heatSource of heatSourceKinds) {
      const r = heatSourceStepSchema.safeParse({ heatSource });
      expect(r.success, heatSource).toBe(!hasHeatPump(heatSource));
      if (!r.success)
        expect(r.error.issues.map((i) => i.path[0])).toEqual(
          expect.arrayContaining(['hpOutputW', 'ntcR25Ohm', 'ntcBetaK']),
        );
    }
  });

  it('checks the cylinder’s exchanger against what each source needs', () => {
    const fits = (k: (typeof heatSourceKinds)[number]) => exchangers.filter((e) => exchangerProblem(e, k) === null);
    expect(fits('hp_plate')).toEqual(['plate_ports']);
    expect(fits('hp_coil')).toEqual(['coil']);
    expect(fits('boiler_coil')).toEqual(['coil']);
    expect(fits('immersion_only')).toEqual([...exchangers]);
    expect(exchangerProblem('none', 'boiler_coil')).toMatch(
      /Boiler through the cylinder’s coil needs a cylinder with an internal coil/,
    );
  });

  it('refuses a charge plan for a boiler-fed cylinder, naming the field', () => {
    const facts = { tank: { heatSource: 'boiler_coil' } } as unknown as PlanFacts;
    expect(() => planInput(facts)).toThrow(PlanRefusal);
    try {
      planInput(facts);
    } catch (e) {
      expect((e as PlanRefusal).field).toBe('heatSource');
      expect((e as PlanRefusal).code).toBe('NotElectricallyHeated');
    }
  });
});
