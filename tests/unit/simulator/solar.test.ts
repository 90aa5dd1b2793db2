import { describe, expect, it } from 'vitest';
import { demoTanks } from '../../../src/lib/demo/scenario';
import { accountDay, type EnergyReading } from '../../../src/lib/energy';
import { SimTank } from '../../../simulator/sim-tank';

const MIN = 60_000;
// Tuesday 14 July 2026, 11:00–14:00 UTC: the demo's sunny-season midday (no pasteurisation day, no space heating).
const MIDDAY = Date.UTC(2026, 6, 14, 11);

function solarTank(nodeC: number): SimTank {
  const demo = demoTanks().find((t) => t.hasSolar && t.heatSource === 'hp_plate' && t.faults.length === 0)!;
  const tank = new SimTank(demo, []);
  const s = tank.snapshot();
  tank.restore({ ...s, nodesC: s.nodesC.map(() => nodeC) });
  return tank;
}

describe('simulated solar diversion', () => {
  it('sends the surplus to the immersion while the tank has room, and reports the surplus it saw', () => {
    const tank = solarTank(35);
    const readings = Array.from({ length: 60 }, (_, i) => tank.step(MIDDAY + i * MIN));
    expect(readings.every((r) => (r.solarSurplusW ?? 0) > 0)).toBe(true);
    const diverted = readings.filter((r) => (r.immersionW ?? 0) > 0);
    expect(diverted.length).toBeGreaterThan(50);
    // A diverter only passes on what would otherwise be exported: never more than the surplus.
    for (const r of diverted) expect(r.immersionW!).toBeLessThanOrEqual(r.solarSurplusW!);
    // So all of the element's heat is accounted as solar, none as grid.
    const rows: EnergyReading[] = readings.map((r) => ({
      ts: r.ts,
      layersC: r.layersC as number[],
      compressor: r.compressor,
      immersionW: r.immersionW,
      powerW: r.powerW,
      drawLpm: r.drawLpm,
      solarSurplusW: r.solarSurplusW,
    }));
    const day = accountDay(
      rows,
      { volumeL: tank.spec.volumeL, uaWPerK: tank.spec.uaWPerK, ambientC: tank.spec.ambientC },
      [],
      { startMs: MIDDAY, endMs: MIDDAY + 60 * MIN, date: '2026-07-14' },
    );
    expect(day.immersionSolarHeatKWh).toBeGreaterThan(0.5);
    expect(day.immersionGridHeatKWh).toBe(0);
  });

  it('diverts nothing once the water the element reaches is at its thermostat (65 °C): the surplus is exported', () => {
    const tank = solarTank(65);
    for (let i = 0; i < 30; i++) {
      const r = tank.step(MIDDAY + i * MIN);
      expect(r.solarSurplusW).toBeGreaterThan(0);
      expect(r.immersionW).toBe(0);
      expect(tank.lastDiversion).toBe('tank_full');
    }
  });

  it('leaves the field out for a home without solar panels', () => {
    const demo = demoTanks().find((t) => !t.hasSolar && t.faults.length === 0)!;
    const r = new SimTank(demo, []).step(MIDDAY);
    expect(r).not.toHaveProperty('solarSurplusW');
  });
});
