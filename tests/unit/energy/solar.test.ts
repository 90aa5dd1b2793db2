import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { solarDiversion } from '../../../src/lib/energy/index.js';

const base = {
  immersionW: 3000,
  volumeL: 200,
  immersionHeightFrac: 0.5,
  layersC: [15, 20, 40, 50],
  divertingW: 0,
  exportW: 0,
};

describe('solarDiversion', () => {
  it('diverts the surplus less the margin, up to the element rating', () => {
    expect(solarDiversion({ ...base, exportW: 1200 })).toMatchObject({ divertW: 1150, reason: 'diverting' });
    // Already diverting 1000 W and still exporting 300 W: the surplus is 1300 W.
    expect(solarDiversion({ ...base, exportW: 300, divertingW: 1000 }).divertW).toBe(1250);
    expect(solarDiversion({ ...base, exportW: 5000 }).divertW).toBe(3000);
  });

  it('diverts nothing without surplus', () => {
    expect(solarDiversion({ ...base, exportW: 30 })).toMatchObject({ divertW: 0, reason: 'no_surplus' });
  });

  it('stops when the water the element reaches is at its thermostat, whatever the layers below', () => {
    const full = solarDiversion({ ...base, exportW: 2000, layersC: [12, 30, 65, 66] });
    expect(full).toMatchObject({ divertW: 0, reason: 'tank_full' });
  });

  it('measures the room above the element: 100 L from 40/50 °C to 65 °C is about 100 kg × 4.18 kJ/(kg·K) × 20 K = 2.3 kWh (IAPWS-IF97 properties)', () => {
    const r = solarDiversion({ ...base, exportW: 2000 });
    // 50 L × (65 − 40) + 50 L × (65 − 50) = 2000 L·K; × ~0.988 kg/L × 4.18 kJ/(kg·K) / 3600 = 2.29 kWh.
    expect(r.roomKWh).toBeGreaterThan(2.25);
    expect(r.roomKWh).toBeLessThan(2.33);
  });

  it('never diverts more than the surplus or the rating (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 10_000, noNaN: true }),
        fc.double({ min: 0, max: 4000, noNaN: true }),
        (exportW, divertingW) => {
          const r = solarDiversion({ ...base, exportW, divertingW });
          expect(r.divertW).toBeGreaterThanOrEqual(0);
          expect(r.divertW).toBeLessThanOrEqual(Math.min(3000, exportW + divertingW));
        },
      ),
    );
  });
});
