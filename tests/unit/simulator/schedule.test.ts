import { describe, expect, it } from 'vitest';
import { demoTanks } from '../../../src/lib/demo/scenario';
import { SimTank } from '../../../simulator/sim-tank';

const MIN = 60_000;

describe('simulated controller: schedule windows', () => {
  it('heats only inside a schedule window, read as wall-clock time at the home (British Summer Time)', () => {
    const demo = demoTanks().find((t) => t.heatSource === 'hp_plate' && t.faults.length === 0 && !t.hasSolar)!;
    const tank = new SimTank(demo);
    // Tuesday 14 July 2026: no pasteurisation day, no space heating in summer. 01:00–03:00 BST is 00:00–02:00 UTC.
    const day = Date.UTC(2026, 6, 14);
    tank.apply({ kind: 'set_schedule', windows: [{ from: '01:00', to: '03:00' }] }, day);
    const onMinutesUtc: number[] = [];
    for (let t = day; t < day + 86_400_000; t += MIN) {
      if (tank.step(t).compressor) onMinutesUtc.push((t - day) / MIN);
    }
    expect(onMinutesUtc.length).toBeGreaterThan(0);
    expect(Math.min(...onMinutesUtc)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...onMinutesUtc)).toBeLessThan(120);
  });

  it('runs a pasteurisation cycle that holds the store at 60 °C or above (HSE HSG274 Part 2) on a 50 °C set-point', () => {
    const demo = demoTanks().find((t) => t.heatSource === 'hp_plate' && t.faults.length === 0 && t.targetC <= 52)!;
    const tank = new SimTank(demo);
    const sunday = Date.UTC(2026, 10, 29); // a Sunday
    let longestAt60 = 0;
    let run = 0;
    for (let t = sunday; t < sunday + 86_400_000; t += MIN) {
      const layers = tank.step(t).layersC as number[];
      const upperHalf = layers.slice(Math.floor(layers.length / 2));
      run = upperHalf.every((c) => c >= 60) ? run + 1 : 0;
      longestAt60 = Math.max(longestAt60, run);
    }
    expect(longestAt60).toBeGreaterThanOrEqual(60);
  });

  const coolTank = (c: number) => {
    const demo = demoTanks().find((t) => t.heatSource === 'hp_plate' && t.faults.length === 0 && !t.hasSolar)!;
    const tank = new SimTank(demo, []);
    const snap = tank.snapshot();
    tank.restore({ ...snap, nodesC: snap.nodesC.map(() => c) });
    return tank;
  };

  it('stops the heat pump when a plan’s window closes, even short of its target', () => {
    const tank = coolTank(30);
    const day = Date.UTC(2026, 6, 14); // 00:00 UTC is 01:00 BST
    tank.apply({ kind: 'set_schedule', windows: [{ from: '01:00', to: '01:20' }], comfortFloorL40: 0 }, day);
    const on: number[] = [];
    for (let t = day; t < day + 3 * 3_600_000; t += MIN) {
      if (tank.step(t).compressor) {
        on.push((t - day) / MIN);
        expect(tank.lastHeat.heatPump).toBe('schedule');
      }
    }
    expect(on.length).toBeGreaterThan(10);
    expect(Math.max(...on)).toBeLessThan(20);
  });

  it('heats outside a plan’s windows for its comfort floor once the store runs low, and says so', () => {
    const tank = coolTank(30); // 30 °C water mixes to no litres at 40 °C at all
    const day = Date.UTC(2026, 6, 14);
    tank.apply({ kind: 'set_schedule', windows: [{ from: '13:00', to: '13:30' }], comfortFloorL40: 65 }, day);
    const r = tank.step(day);
    expect(r.compressor).toBe(true);
    expect(tank.lastHeat.heatPump).toBe('comfort');
    // Without a floor the same windows are strict: nothing before 13:00.
    const strict = coolTank(30);
    strict.apply({ kind: 'set_schedule', windows: [{ from: '13:00', to: '13:30' }] }, day);
    expect(strict.step(day).compressor).toBe(false);
  });
});
