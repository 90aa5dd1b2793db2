// Hot paths of the thermal core over a fleet. Run with `npm run bench:thermal`.
// Figures go here, never into unit tests: the machines are shared and timings are noisy.
import { afterAll, bench, describe } from 'vitest';
import {
  createTank,
  mixedWaterLitres,
  stateOfCharge,
  stepTankInPlace,
  storedEnergyKWh,
} from '../../src/lib/thermal/index.js';
import type { TankSpec } from '../../src/lib/thermal/index.js';

const PROFILES = 100_000;
const FLEET = 240;
const STEPS_PER_DAY = 1440;

// Deterministic pseudo-random profiles (a small LCG keeps runs comparable).
let seed = 12345;
const rand = (): number => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
const profiles: number[][] = Array.from({ length: PROFILES }, () => {
  const n = 8 + Math.floor(rand() * 9);
  const interface_ = rand() * n;
  return Array.from({ length: n }, (_, i) => (i < interface_ ? 10 + rand() * 10 : 45 + rand() * 15));
});

const specs: TankSpec[] = Array.from({ length: FLEET }, (_, k) => ({
  volumeL: 150 + (k % 7) * 25,
  sensorCount: 8 + (k % 9),
  heightM: 1.2 + (k % 5) * 0.1,
  ambientC: 16 + (k % 4),
  uaWPerK: 1.2 + (k % 6) * 0.2,
  heatSource: k % 10 === 0 ? 'immersion_only' : k % 4 === 0 ? 'hp_coil' : 'hp_plate',
  hpOutputW: k % 10 === 0 ? 0 : 5000 + (k % 4) * 1000,
  immersionW: 3000,
  immersionHeightFrac: 0.6,
}));

function fleetDay(): number {
  let steps = 0;
  for (const spec of specs) {
    const state = createTank(spec, 45);
    let hpOn = false;
    for (let m = 0; m < STEPS_PER_DAY; m++) {
      const top = state.nodesC[state.nodesC.length - 1]!;
      if (top < 45) hpOn = true;
      else if (top > 54) hpOn = false;
      const drawing = (m > 420 && m < 432) || (m > 1260 && m < 1270) || m % 97 === 0;
      stepTankInPlace(spec, state, {
        dtS: 60,
        coldC: 10,
        drawLpm: drawing ? 7 : 0,
        hpOn: hpOn && spec.hpOutputW > 0,
        immersionOn: hpOn && spec.hpOutputW === 0,
      });
      steps++;
    }
  }
  return steps;
}

describe(`fleet computations (${PROFILES.toLocaleString('en')} tank profiles)`, () => {
  bench(
    'stateOfCharge',
    () => {
      for (const layersC of profiles) stateOfCharge({ layersC, coldC: 10, targetC: 55 });
    },
    { iterations: 5 },
  );
  bench(
    'mixedWaterLitres (V40)',
    () => {
      for (const layersC of profiles) mixedWaterLitres({ layersC, volumeL: 200, coldC: 10, deliveryC: 40 });
    },
    { iterations: 5 },
  );
  bench(
    'storedEnergyKWh',
    () => {
      for (const layersC of profiles) storedEnergyKWh({ layersC, volumeL: 200, refC: 10 });
    },
    { iterations: 5 },
  );
});

describe(`tank model (${FLEET} tanks × one day at 1-minute steps)`, () => {
  bench(
    'fleet day',
    () => {
      fleetDay();
    },
    { iterations: 3 },
  );
});

afterAll(() => {
  // A plain figure for the simulator's budget: steps per second and the 14-day backfill it implies.
  const t0 = performance.now();
  const steps = fleetDay();
  const s = (performance.now() - t0) / 1000;
  const perStepUs = (s / steps) * 1e6;
  const backfillSteps = FLEET * STEPS_PER_DAY * 14;
  console.log(
    `tank model: ${steps.toLocaleString('en')} steps in ${s.toFixed(3)} s = ${perStepUs.toFixed(2)} µs/step; ` +
      `14-day backfill of ${FLEET} tanks (${backfillSteps.toLocaleString('en')} steps) ≈ ${((backfillSteps * perStepUs) / 1e6).toFixed(1)} s`,
  );
});
