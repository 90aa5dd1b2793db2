import { describe, expect, it } from 'vitest';
import { stepProblems, validateAnswers } from '../../../src/lib/commissioning/steps';

const cylinder = {
  serial: 'C210-T-0001',
  model: 'C210 cylinder',
  volumeL: '210',
  heightM: '1.6',
  sensorCount: '4',
  exchanger: 'plate_ports',
  immersionW: '3000',
};

describe('wizard step checks', () => {
  it('reads numbers typed as text and treats empty optional fields as not given', () => {
    expect(stepProblems('cylinder', { ...cylinder, declaredLossW: '' })).toEqual([]);
  });

  it('names the field and says what to do', () => {
    const p = stepProblems('home', {
      addressLine: '',
      town: 'Larkholt',
      postcode: 'WM4 1AA',
      occupants: '0',
      contactName: 'Sam',
      contactEmail: 'not-an-address',
    });
    expect(p).toEqual(
      expect.arrayContaining([
        { field: 'home.addressLine', message: 'Enter the address.' },
        { field: 'home.occupants', message: 'The number of occupants must be at least 1 people.' },
        { field: 'home.contactEmail', message: 'Enter the householder’s e-mail address (name@example.com).' },
      ]),
    );
  });

  it('checks sensor heights against the count, their order and the cylinder’s height', () => {
    expect(stepProblems('cylinder', { ...cylinder, sensorHeightsM: '0.1, 0.5' })[0].message).toMatch(/Give 4 heights/);
    expect(stepProblems('cylinder', { ...cylinder, sensorHeightsM: '0.1, 0.5, 0.4, 1.2' })[0].message).toMatch(
      /bottom to top/,
    );
    expect(stepProblems('cylinder', { ...cylinder, sensorHeightsM: '0.1, 0.5, 0.9, 1.7' })[0].message).toMatch(
      /above the top/,
    );
    expect(stepProblems('cylinder', { ...cylinder, sensorHeightsM: '0.1, 0.5, 0.9, 1.4' })).toEqual([]);
  });

  it('asks a heat pump for its sensor curve and switching temperatures', () => {
    const fields = stepProblems('heat_source', { heatSource: 'hp_plate' }).map((p) => p.field);
    expect(fields).toEqual([
      'heat_source.hpOutputW',
      'heat_source.ntcR25Ohm',
      'heat_source.ntcBetaK',
      'heat_source.callC',
      'heat_source.satisfiedC',
    ]);
    expect(stepProblems('heat_source', { heatSource: 'immersion_only' })).toEqual([]);
  });

  it('asks how the water is pasteurised when stored below 60 °C', () => {
    // HSE HSG274 Part 2 (2014): store hot water at 60 °C or above.
    expect(stepProblems('target', { targetC: '55', hysteresisK: '5' }).map((p) => p.field)).toEqual([
      'target.belowSixtyPlan',
    ]);
    expect(stepProblems('target', { targetC: '60', hysteresisK: '5' })).toEqual([]);
  });

  it('refuses an unticked safety item by name', () => {
    const p = stepProblems('safety', {
      expansion: true,
      reliefValve: true,
      discharge: true,
      reducingValve: true,
      competentPerson: true,
    });
    expect(p).toEqual([
      { field: 'safety.isolation', message: expect.stringMatching(/^Check and tick: Electrical isolation/) },
    ]);
  });

  it('cross-checks the heat source against the cylinder’s exchanger', () => {
    const r = validateAnswers(
      {
        cylinder: { ...cylinder, exchanger: 'coil' },
        heat_source: {
          heatSource: 'hp_plate',
          hpOutputW: 8000,
          ntcR25Ohm: 10000,
          ntcBetaK: 3977,
          callC: 6,
          satisfiedC: 47,
        },
      },
      ['cylinder', 'heat_source'],
    );
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.problems).toEqual([
        {
          field: 'heat_source.heatSource',
          message: expect.stringMatching(/needs a cylinder with ports for a plate heat exchanger/),
        },
      ]);
  });
});
