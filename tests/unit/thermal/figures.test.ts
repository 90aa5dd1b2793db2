import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  columnMeanC,
  createTank,
  sensorReadings,
  stepTankInPlace,
  tankFigures,
  ThermalInputError,
  EN16147_COLD_C,
  EN16147_DELIVERY_C,
} from '../../../src/lib/thermal/index.js';
import type { TankGeometry, TankSpec } from '../../../src/lib/thermal/index.js';

const geometry = (n: number, volumeL = 210, heightM = 1.4): TankGeometry => ({
  volumeL,
  heightM,
  sensorCount: n,
  targetC: 55,
});

/**
 * A simulated profile from the thermal core's tank model: a cylinder heated uniformly to `hotC`,
 * then `drawnL` litres drawn from the top at 10 L/min with cold water entering at 10 °C (EN 16147's
 * cold water), then `reheatMin` minutes of the heat pump: a thermocline somewhere in the column.
 */
function simulatedProfile(p: {
  n: number;
  volumeL: number;
  hotC: number;
  drawnL: number;
  reheatMin: number;
}): number[] {
  const spec: TankSpec = {
    volumeL: p.volumeL,
    sensorCount: p.n,
    heightM: 1.4,
    ambientC: 18,
    uaWPerK: 1.5,
    heatSource: 'hp_plate',
    hpOutputW: 5000,
    immersionW: 3000,
    immersionHeightFrac: 0.6,
  };
  const state = createTank(spec, p.hotC);
  for (let drawn = 0; drawn < p.drawnL; drawn += 10)
    stepTankInPlace(spec, state, { dtS: 60, coldC: 10, drawLpm: 10, hpOn: false, immersionOn: false });
  for (let m = 0; m < p.reheatMin; m++)
    stepTankInPlace(spec, state, {
      dtS: 60,
      coldC: 10,
      drawLpm: 0,
      hpOn: true,
      immersionOn: false,
      hpFlowC: p.hotC + 3,
    });
  return sensorReadings(spec, state);
}

describe('tankFigures', () => {
  it('counts V40 from EN 16147 cold water and delivery temperatures unless the home has its own cold inlet', () => {
    // EN 16147: V40 is mixed water at 40 °C from cold water at 10 °C.
    expect(EN16147_COLD_C).toBe(10);
    expect(EN16147_DELIVERY_C).toBe(40);
    const f = tankFigures({ layersC: Array(8).fill(55) }, geometry(8, 200));
    // A fully mixed 200 L at 55 °C: 200·(55 − 10)/(40 − 10) = 300 L (EN 16147 definition; equal layers).
    expect(f.v40L).toBeCloseTo(300, 6);
    expect(f.quality).toEqual({ status: 'measured', leftOut: [], faults: [], reason: null });
    const warmInlet = tankFigures({ layersC: Array(8).fill(55) }, { ...geometry(8, 200), coldInletC: 15 });
    expect(warmInlet.coldC).toBe(15);
    expect(warmInlet.v40L).toBeCloseTo((200 * (55 - 15)) / (40 - 15), 6);
  });

  it('estimates a missing sensor from its neighbours by height and says which one was left out', () => {
    const layers = [15, 20, 30, 40, 50, 55, 56, 57];
    const gap = [...layers];
    gap[3] = null as unknown as number;
    // Sensors at uneven heights: sensor 4 sits a quarter of the way from sensor 3 to sensor 5.
    const heights = [0.1, 0.3, 0.5, 0.6, 0.9, 1.1, 1.2, 1.3];
    const f = tankFigures({ layersC: gap }, { ...geometry(8), sensorHeightsM: heights });
    expect(f.quality.status).toBe('estimated');
    expect(f.quality.leftOut).toEqual([4]);
    expect(f.quality.reason).toBe('Estimated, sensor 4 left out (no reading).');
    expect(f.layersC![3]).toBeCloseTo(30 + (50 - 30) * (0.1 / 0.4), 9);
    expect(f.v40L).not.toBeNull();
  });

  it('leaves out two swapped sensors and not the good sensors above them', () => {
    // Sensor 2 and sensor 11 swapped: 55 °C near the bottom, 24 °C near the top.
    const swapped = [15, 55, 18, 22, 30, 45, 52, 55, 56, 57, 24, 58];
    const truth = [15, 16.5, 18, 22, 30, 45, 52, 55, 56, 57, 57.5, 58];
    const f = tankFigures({ layersC: swapped }, geometry(12));
    expect(f.quality.status).toBe('estimated');
    expect(f.quality.leftOut).toEqual([2, 11]);
    expect(f.quality.faults.map((x) => x.fault)).toEqual(['out_of_order', 'out_of_order']);
    const ref = tankFigures({ layersC: truth }, geometry(12));
    expect(Math.abs(f.v40L! - ref.v40L!)).toBeLessThan(1);
    expect(Math.abs(f.soc! - ref.soc!)).toBeLessThan(0.01);
  });

  it('leaves out an open (out of range) sensor and a stuck one named by the check over time', () => {
    const f = tankFigures({ layersC: [15, -40, 30, 45, 55, 58] }, geometry(6), { stuck: [3] });
    expect(f.quality.faults).toEqual([
      { sensor: 2, fault: 'out_of_range' },
      { sensor: 4, fault: 'stuck' },
    ]);
    expect(f.quality.status).toBe('estimated');
    expect(f.layersC![1]).toBeCloseTo(22.5, 9);
    expect(f.layersC![3]).toBeCloseTo(42.5, 9);
  });

  it('withholds the figures when the top sensor or two adjacent sensors are left out', () => {
    const top = tankFigures({ layersC: [15, 30, 45, null] }, geometry(4));
    expect(top.quality.status).toBe('withheld');
    expect(top.quality.reason).toMatch(/top sensor \(4\)/);
    expect([top.soc, top.v40L, top.storedKWh, top.toFullKWh, top.mix, top.layersC]).toEqual([
      null,
      null,
      null,
      null,
      null,
      null,
    ]);
    // A reading shorter than the sensor count lacks its top sensors.
    expect(tankFigures({ layersC: [15, 30, 45] }, geometry(4)).quality.status).toBe('withheld');
    const pair = tankFigures({ layersC: [15, null, 120, 50, 55] }, geometry(5));
    expect(pair.quality.status).toBe('withheld');
    expect(pair.quality.leftOut).toEqual([2, 3]);
    expect(pair.quality.reason).toMatch(
      /sensors 2 and 3 are left out side by side \(no reading, reading out of range\)/,
    );
  });

  it('refuses an impossible geometry by naming the field', () => {
    expect(() => tankFigures({ layersC: [50] }, { ...geometry(1), volumeL: 0 })).toThrow(ThermalInputError);
    expect(() => tankFigures({ layersC: [50] }, { ...geometry(1), coldInletC: 45 })).toThrow(/geometry.coldInletC/);
  });

  /*
   * The estimate against the tank model. Tolerance: the mixed water at 40 °C that the left-out
   * layer alone can hold, (V/n)·(Tmax − Tcold)/(40 − Tcold), with EN 16147's 40 °C and 10 °C.
   * Why: V40 counts layers from the top while they are at or above 40 °C. In a stable (monotone)
   * profile the interpolated value lies between its neighbours, so the estimate can change only
   * that layer's own share, either by its temperature error (at most the neighbours' difference)
   * or by moving that one layer across 40 °C (a thermocline between sensors); the layers above
   * are measured and the ones below would stop the count in either case.
   */
  it("keeps V40 within one layer's share of the full-column value with one sensor left out", () => {
    fc.assert(
      fc.property(
        fc.record({
          n: fc.integer({ min: 8, max: 16 }),
          volumeL: fc.integer({ min: 150, max: 300 }),
          hotC: fc.integer({ min: 45, max: 65 }),
          drawnFrac: fc.double({ min: 0, max: 0.9, noNaN: true }),
          reheatMin: fc.integer({ min: 0, max: 20 }),
          drop: fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }),
        }),
        (p) => {
          const layers = simulatedProfile({ ...p, drawnL: p.drawnFrac * p.volumeL });
          const g = { ...geometry(p.n, p.volumeL) };
          const full = tankFigures({ layersC: layers }, g);
          expect(full.quality.status).toBe('measured');
          const drop = Math.floor(p.drop * (p.n - 1)); // any sensor but the top
          const gap: (number | null)[] = [...layers];
          gap[drop] = null;
          const est = tankFigures({ layersC: gap }, g);
          expect(est.quality.status).toBe('estimated');
          const tMax = Math.max(...layers);
          const tolerance =
            ((p.volumeL / p.n) * Math.max(0, tMax - EN16147_COLD_C)) / (EN16147_DELIVERY_C - EN16147_COLD_C);
          expect(Math.abs(est.v40L! - full.v40L!)).toBeLessThanOrEqual(tolerance + 1e-9);
          // State of charge moves by at most that layer's volume share (common practice: a mean over layers).
          expect(Math.abs(est.soc! - full.soc!)).toBeLessThanOrEqual(1 / p.n + 1e-9);
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe('columnMeanC', () => {
  it('weights each layer by the water it stands for', () => {
    // Sensors at 0.1, 0.3 and 1.0 m in a 1.2 m column stand for 0–0.2, 0.2–0.65 and 0.65–1.2 m
    // (half-way to each neighbour: the definition layerThicknesses uses; arithmetic, common practice).
    const mean = columnMeanC([20, 40, 60], { heightM: 1.2, sensorHeightsM: [0.1, 0.3, 1.0] });
    expect(mean).toBeCloseTo((20 * 0.2 + 40 * 0.45 + 60 * 0.55) / 1.2, 9);
    // Evenly spaced sensors: the plain mean.
    expect(columnMeanC([20, 40, 60], { heightM: 1.2, sensorHeightsM: null })).toBeCloseTo(40, 9);
  });
});
