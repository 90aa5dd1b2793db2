import { describe, expect, it } from 'vitest';
import { demoTanks } from '../../../src/lib/demo/scenario';
import { compressorCycles, shortCycleViolations } from '../../../src/lib/thermal';
import { drawsForDay } from '../../../simulator/household';
import { SimTank } from '../../../simulator/sim-tank';

const MIN = 60_000;
const DAY = 86_400_000;
const start = Date.parse('2026-01-10T00:00:00Z');
const hpTank = demoTanks().find((t) => t.heatSource === 'hp_plate' && t.faults.length === 0)!;

function run(tank: SimTank, minutes: number) {
  return Array.from({ length: minutes }, (_, i) => tank.step(start + i * MIN));
}

describe('simulated tank', () => {
  it('starts its heat pump at most once an hour for hot water (common practice), and short-cycles with the fault', () => {
    const healthy = run(new SimTank(hpTank, []), 2 * 1440);
    const starts = compressorCycles(healthy.map((r) => ({ t: r.ts, on: r.compressor === true }))).starts;
    expect(starts.length).toBeGreaterThan(0);
    expect(shortCycleViolations(starts, { minGapMin: 60 })).toEqual([]);
    const faulty = run(new SimTank(hpTank, ['short_cycle']), 2 * 1440);
    const fStarts = compressorCycles(faulty.map((r) => ({ t: r.ts, on: r.compressor === true }))).starts;
    expect(shortCycleViolations(fStarts, { minGapMin: 60 }).length).toBeGreaterThan(0);
  });

  it('reports the injected sensor faults', () => {
    const n = hpTank.sensorCount;
    const open = run(new SimTank(hpTank, ['sensor_open']), 10);
    expect(open.every((r) => r.layersC[2] === null)).toBe(true);
    const stuck = run(new SimTank(hpTank, ['sensor_stuck']), 600);
    expect(new Set(stuck.map((r) => r.layersC[n - 3])).size).toBe(1);
    const swapped = run(new SimTank(hpTank, ['sensors_swapped']), 10);
    // A healthy column is warmer higher up; swapped sensors show the lower one hotter.
    expect(swapped[9].layersC[1]!).toBeGreaterThan(swapped[9].layersC[n - 2]!);
  });

  it('keeps the element on with immersion_stuck and never lets it exceed the element thermostat', () => {
    const readings = run(new SimTank(hpTank, ['immersion_stuck']), 1440);
    expect(readings.filter((r) => (r.immersionW ?? 0) > 0).length).toBeGreaterThan(100);
    // The model's element thermostat cuts at 65 °C (src/lib/thermal/tank-model.ts default; common practice).
    expect(Math.max(...readings.flatMap((r) => r.layersC.filter((x): x is number => x !== null)))).toBeLessThan(66);
  });

  it('obeys a boost with its element in the next minute', () => {
    const tank = new SimTank(hpTank, []);
    run(tank, 5);
    tank.apply({ kind: 'boost', minutes: 30 }, start + 5 * MIN);
    expect(tank.step(start + 6 * MIN).immersionW).toBeGreaterThan(0);
  });

  it('plans household draws near the EN 16147 profile energy, varied day to day', () => {
    // Profile M is 5.845 kWh/day (Regulation (EU) No 814/2013, Annex III). The demo skips about one
    // draw in eight and scales days by ±25 %, so over two months the mean day stays within 70–110 %
    // of Qref and no day exceeds 150 % (demo variation, not a standard's figure).
    const days = Array.from({ length: 60 }, (_, d) => drawsForDay(hpTank.serial, 2, start + d * DAY));
    const energies = days.map((ds) => ds.reduce((s, x) => s + x.energyKWh, 0));
    const mean = energies.reduce((a, b) => a + b, 0) / energies.length;
    expect(mean).toBeGreaterThan(5.845 * 0.7);
    expect(mean).toBeLessThan(5.845 * 1.1);
    for (const e of energies) expect(e).toBeLessThan(5.845 * 1.5);
    expect(new Set(energies).size).toBe(60);
  });
});
