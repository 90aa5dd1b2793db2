// Charge-planner run time: one home over 48 hours at 30-minute steps, and a fleet of 10,000 homes.
// Run with `npm run bench:planner`. Figures only; tests never assert timings (shared, noisy machines).
import { afterAll, bench, describe } from 'vitest';
import { demandPrior, demandSeries, planCharge } from '../../src/lib/energy/index.js';
import type { ChargePlanInput } from '../../src/lib/energy/index.js';
import { createTank, estimatedCop } from '../../src/lib/thermal/index.js';
import type { TankSpec } from '../../src/lib/thermal/index.js';

const START = Date.UTC(2025, 0, 6, 12);
const STEPS = 96;
const FLEET = 10_000;

let seed = 424242;
const rand = (): number => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
const prices = (): number[] =>
  Array.from({ length: STEPS }, (_, i) => {
    const h = (12 + i / 2) % 24;
    const base = h >= 0.5 && h < 4.5 ? 7.5 : h >= 16 && h < 19 ? 38 : 26;
    return Math.round((base + (rand() - 0.5) * 6) * 100) / 100;
  });

function home(k: number): ChargePlanInput {
  const spec: TankSpec = {
    volumeL: 150 + (k % 7) * 25,
    sensorCount: 8 + (k % 9),
    heightM: 1.2 + (k % 5) * 0.1,
    ambientC: 16 + (k % 4),
    uaWPerK: 1.2 + (k % 6) * 0.2,
    heatSource: k % 12 === 0 ? 'immersion_only' : k % 4 === 0 ? 'hp_coil' : 'hp_plate',
    hpOutputW: k % 12 === 0 ? 0 : 4000 + (k % 4) * 1000,
    immersionW: 3000,
    immersionHeightFrac: 0.6,
  };
  const occupants = 1 + (k % 6);
  return {
    spec,
    state: createTank(spec, 46 + (k % 8)),
    startMs: START,
    importPence: prices(),
    demandLitres40: demandSeries(
      { timeZone: 'UTC', litres40ByHour: demandPrior(occupants), weeksObserved: [], prior: [] },
      START,
      STEPS,
    ),
    comfortFloorL40: 65,
    cop: estimatedCop({ sinkC: 55, sourceC: 2 + (k % 8) }),
  };
}

const one = home(1);
describe('charge planner, 48 h at 30-minute steps', () => {
  bench(
    'one home (plan, full-model check, baseline)',
    () => {
      planCharge(one);
    },
    { iterations: 20 },
  );
});

// The fleet runs once, in chunks that yield to the event loop so the bench worker stays responsive.
afterAll(async () => {
  const t0 = performance.now();
  let met = 0,
    repairs = 0,
    saved = 0,
    slowest = 0;
  for (let k = 0; k < FLEET; k++) {
    const input = home(k);
    const a = performance.now();
    const p = planCharge(input);
    slowest = Math.max(slowest, performance.now() - a);
    if (p.floorMet) met++;
    repairs += p.repairs;
    saved += p.savingsPence;
    if (k % 100 === 99) await new Promise((r) => setImmediate(r));
  }
  const s = (performance.now() - t0) / 1000;
  console.log(
    `planner fleet: ${FLEET.toLocaleString('en')} homes × ${STEPS} steps in ${s.toFixed(1)} s = ${((s / FLEET) * 1000).toFixed(2)} ms/home on one core ` +
      `(slowest ${slowest.toFixed(0)} ms); floor met in ${met} (${((met / FLEET) * 100).toFixed(2)} %), ${(repairs / FLEET).toFixed(2)} re-solves/home, ` +
      `mean saving ${(saved / FLEET).toFixed(1)} p per 48 h against the thermostat`,
  );
}, 3_600_000);
