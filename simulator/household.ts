// A household's hot-water draws for one day: the EN 16147 tapping cycle that fits the number of
// occupants, varied day to day (times shifted, some draws skipped, energies scaled) so that no
// two days or homes look alike. Deterministic per serial and day.
import { seededRandom } from '../src/lib/demo/random';
import { tappingProfile, type TappingProfileSize } from '../src/lib/thermal';

export interface PlannedDraw {
  /** Start, epoch ms. */
  at: number;
  /** Useful energy to deliver, kWh (relative to the cold water). */
  energyKWh: number;
  /** Mixed-water flow at the tap, l/min. */
  flowLpm: number;
  /** Temperature the user mixes to, °C. */
  mixC: number;
}

/** Demo choice: bigger households draw the bigger profiles. */
function profileFor(occupants: number): TappingProfileSize {
  return occupants <= 2 ? 'M' : occupants <= 4 ? 'L' : 'XL';
}

function hashSeed(text: string): number {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return h >>> 0;
}

/** The draws of the local day that starts at `dayStartMs` (midnight UTC, the demo's local time). */
export function drawsForDay(serial: string, occupants: number, dayStartMs: number): PlannedDraw[] {
  const rand = seededRandom(hashSeed(`${serial}:${Math.floor(dayStartMs / 86_400_000)}`));
  const weekday = new Date(dayStartMs).getUTCDay();
  const lateStart = weekday === 0 || weekday === 6 ? 60 : 0; // weekends start later (demo)
  const dayScale = 0.75 + rand() * 0.5;
  const out: PlannedDraw[] = [];
  for (const d of tappingProfile(profileFor(occupants)).draws) {
    if (rand() < 0.12) continue;
    const shiftMin = lateStart + Math.round((rand() + rand() + rand() - 1.5) * 25);
    out.push({
      at: dayStartMs + (d.minuteOfDay + shiftMin) * 60_000,
      energyKWh: d.energyKWh * dayScale * (0.85 + rand() * 0.3),
      flowLpm: d.flowLpm,
      // Where the table sets only a peak temperature, people still mix to about 40 °C (demo).
      mixC: Math.max(d.usefulC, d.peakC ?? 0, 25) > 45 ? 45 : Math.max(d.usefulC, d.peakC ?? 40),
    });
  }
  return out.sort((a, b) => a.at - b.at);
}
