// Where a day's hot-water energy came from, went to, and what it cost, from the stored readings.
//
// Each reading's rates (compressor, immersion power, electric power, draw, solar surplus) hold from
// its time to the next reading's (one a minute); an interval belongs to the day its start falls in.
// Heat into the tank is closed by the energy balance of each interval,
//     heat in = ΔE (stored, from the layers) + heat drawn + standing loss,
// where ΔE comes from storedEnergyKWh (IAPWS-IF97), the draw carries the top layer's heat above
// cold water, and the standing loss is UA·(mean layer temperature − ambient). An immersion element
// turns all its electricity into heat in the water, so its heat is its metered energy; the heat
// pump's heat is what the balance leaves over the intervals it runs (and a short tail after, while
// the loop still carries heat). What the balance leaves elsewhere is reported as residual: it is
// sensor noise and model error, and should be small.
import { storedEnergyKWh, waterCp, waterDensity } from '../thermal/index.js';
import { EnergyInputError } from './errors.js';
import { priceAt } from './tariff.js';
import type { Tariffs } from './tariff.js';
import { DEFAULT_COLD_C, HALF_HOUR_MS, J_PER_KWH, kWhPerLitreAt40 } from './units.js';
import { epochMs, finite, nonNegative, positive } from './validate.js';

/** One stored telemetry reading (one a minute), as the readings table holds it. */
export interface EnergyReading {
  /** Time of the reading, epoch ms. */ ts: number;
  /** Layer temperatures, °C, bottom to top. */ layersC: readonly number[];
  /** Heat pump running for hot water. */ compressor?: boolean;
  /** Immersion element electric power, W. */ immersionW?: number;
  /** Electric input of whatever heats the tank (heat pump and immersion together), W. */ powerW?: number;
  /** Hot-water draw, litres per minute. */ drawLpm?: number;
  /** Solar power available beyond the household's own use, before any diversion to the immersion, W. */ solarSurplusW?: number;
}

/** What the accounting needs of a cylinder (a subset of the thermal core's TankSpec). */
export interface AccountingTank {
  /** Stored volume, litres. */ volumeL: number;
  /** Standing-loss coefficient UA, W/K. */ uaWPerK: number;
  /** Air temperature around the cylinder, °C. */ ambientC: number;
  /** Optional thickness of each layer, metres (default equal shares). */ heightsM?: readonly number[];
}

/** Options of {@link accountDay}. */
export interface AccountDayOptions {
  /** Start of the day, epoch ms (inclusive). */ startMs: number;
  /** End of the day, epoch ms (exclusive). */ endMs: number;
  /** Local calendar date of the day, "YYYY-MM-DD", carried to the monthly roll-up. */ date: string;
  /** Cold-water temperature, °C (default 10, the EN 16147 reference). */ coldC?: number;
  /** An interval longer than this between readings is a gap and is not integrated, ms (default 5 min). */ maxGapMs?: number;
  /** Heat arriving this long after the compressor stops is still the heat pump's, ms (default 5 min). */ hpTailMs?: number;
}

/** Energy and cost of one home's hot water over one day. Energies kWh, money pence. */
export interface DayEnergy {
  /** Local calendar date, "YYYY-MM-DD". */ date: string;
  /** Bounds of the day, epoch ms. */ startMs: number;
  endMs: number;
  /** Heat into the water from the heat pump, kWh. */ heatPumpHeatKWh: number;
  /** Heat from the immersion on grid electricity, kWh. */ immersionGridHeatKWh: number;
  /** Heat from the immersion on diverted solar surplus (free), kWh. */ immersionSolarHeatKWh: number;
  /** All heat in, kWh. */ heatInKWh: number;
  /** Heat carried out by draws (above cold water), kWh. */ drawnKWh: number;
  /** Heat drawn expressed as litres of mixed water at 40 °C, L. */ drawnLitres40: number;
  /** Heat lost standing, kWh. */ standingLossKWh: number;
  /** Stored energy at the end of the day minus at the start, kWh. */ storedChangeKWh: number;
  /** Balance left where no source ran (noise and model error), kWh; in + residual = ΔE + drawn + loss. */ residualKWh: number;
  /** Heat-pump electricity, kWh. */ heatPumpElectricityKWh: number;
  /** Immersion electricity from the grid, kWh. */ immersionGridElectricityKWh: number;
  /** Immersion electricity from solar surplus, kWh (costs nothing). */ immersionSolarElectricityKWh: number;
  /** Cost of the heat pump's electricity at the tariff in force each half hour, pence. */ heatPumpCostPence: number;
  /** Cost of the immersion's grid electricity, pence. */ immersionCostPence: number;
  /** heatPumpCostPence + immersionCostPence, pence. */ costPence: number;
  /** What the diverted surplus would have earned exported, pence (the price of the "free" heat). */ solarExportForgonePence: number;
  /** Grid electricity used when no tariff was in force (left out of the cost), kWh. */ unpricedKWh: number;
  /** Heat-pump heat over heat-pump electricity, or null when the heat pump used none. */ dhwCop: number | null;
  /** Minutes integrated. */ coveredMinutes: number;
  /** Minutes lost to gaps between readings. */ gapMinutes: number;
}

function layerMean(layersC: readonly number[], shares: readonly number[] | null): number {
  let s = 0;
  for (let i = 0; i < layersC.length; i++) s += layersC[i]! * (shares ? shares[i]! : 1 / layersC.length);
  return s;
}

/**
 * Account one day of one home's hot water from its readings (sorted by time, one a minute; the first
 * reading after the day may be included to close the last interval). Costs use the import price in
 * force at each half hour (`tariffs` as for priceAt); diverted solar costs nothing. Throws
 * EnergyInputError naming the first unusable reading field.
 */
export function accountDay(
  readings: readonly EnergyReading[],
  tank: AccountingTank,
  tariffs: Tariffs,
  options: AccountDayOptions,
): DayEnergy {
  const startMs = epochMs('options.startMs', options.startMs);
  const endMs = epochMs('options.endMs', options.endMs);
  if (endMs <= startMs) throw new EnergyInputError('options.endMs', 'options.endMs must be after options.startMs.');
  const coldC = finite('options.coldC', options.coldC ?? DEFAULT_COLD_C, '°C');
  const maxGapMs = positive('options.maxGapMs', options.maxGapMs ?? 300_000, 'ms');
  const tailMs = nonNegative('options.hpTailMs', options.hpTailMs ?? 300_000, 'ms');
  const volumeL = positive('tank.volumeL', tank.volumeL, 'litres');
  const ua = nonNegative('tank.uaWPerK', tank.uaWPerK, 'W/K');
  const ambientC = finite('tank.ambientC', tank.ambientC, '°C');

  const n = readings[0]?.layersC.length ?? 0;
  let shares: number[] | null = null;
  if (tank.heightsM) {
    const total = tank.heightsM.reduce((a, b) => a + b, 0);
    shares = tank.heightsM.map((h) => h / total);
  }
  const energies = new Array<number>(readings.length);
  for (let i = 0; i < readings.length; i++) {
    const r = readings[i]!;
    epochMs(`readings[${i}].ts`, r.ts);
    if (i > 0 && r.ts <= readings[i - 1]!.ts)
      throw new EnergyInputError(
        `readings[${i}].ts`,
        `readings[${i}].ts is not after the reading before it: readings must be sorted by time without duplicates.`,
      );
    if (!Array.isArray(r.layersC) || r.layersC.length !== n || n === 0)
      throw new EnergyInputError(
        `readings[${i}].layersC`,
        `readings[${i}].layersC must hold ${n || 'one or more'} layer temperatures, bottom to top, like the first reading.`,
      );
    for (const field of ['immersionW', 'powerW', 'drawLpm', 'solarSurplusW'] as const) {
      if (r[field] !== undefined)
        finite(`readings[${i}].${field}`, r[field], field === 'drawLpm' ? 'litres per minute' : 'W');
    }
    energies[i] = storedEnergyKWh({
      layersC: r.layersC,
      volumeL,
      refC: coldC,
      ...(tank.heightsM ? { heightsM: tank.heightsM } : {}),
    });
  }

  const slotGrid = new Map<number, { hp: number; imm: number; solar: number }>();
  const addToSlots = (a: number, b: number, hpW: number, immGridW: number, solarW: number): void => {
    for (let t = a; t < b; ) {
      const slot = Math.floor(t / HALF_HOUR_MS);
      const until = Math.min(b, (slot + 1) * HALF_HOUR_MS);
      const h = (until - t) / 3_600_000 / 1000; // kWh per W
      const s = slotGrid.get(slot) ?? { hp: 0, imm: 0, solar: 0 };
      s.hp += hpW * h;
      s.imm += immGridW * h;
      s.solar += solarW * h;
      slotGrid.set(slot, s);
      t = until;
    }
  };

  let hpHeat = 0,
    immGrid = 0,
    immSolar = 0,
    drawn = 0,
    loss = 0,
    residual = 0,
    hpElec = 0,
    covered = 0,
    gap = 0;
  let firstE: number | null = null,
    lastE = 0,
    lastCompressorMs = -Infinity;
  for (let i = 0; i + 1 < readings.length; i++) {
    const r = readings[i]!;
    if (r.ts < startMs || r.ts >= endMs) continue;
    const next = readings[i + 1]!;
    if (firstE === null) firstE = energies[i]!;
    lastE = energies[i + 1]!;
    const dtMs = next.ts - r.ts;
    const dE = energies[i + 1]! - energies[i]!;
    if (r.compressor) lastCompressorMs = r.ts + dtMs;
    if (dtMs > maxGapMs) {
      gap += dtMs / 60_000;
      residual += dE;
      continue;
    }
    covered += dtMs / 60_000;
    const hours = dtMs / 3_600_000;
    const top = r.layersC[n - 1]!;
    const lift = Math.max(0, top - coldC);
    const drawL = Math.max(0, r.drawLpm ?? 0) * (dtMs / 60_000);
    const qDraw = ((drawL / 1000) * waterDensity(top) * waterCp((top + coldC) / 2) * lift) / J_PER_KWH;
    const qLoss = (ua * (layerMean(r.layersC, shares) - ambientC) * hours) / 1000;
    const immW = Math.max(0, r.immersionW ?? 0);
    const solarW = Math.min(immW, Math.max(0, r.solarSurplusW ?? 0));
    const hpW = r.compressor ? Math.max(0, (r.powerW ?? 0) - immW) : 0;
    const qImm = (immW * hours) / 1000;
    const qIn = dE + qDraw + qLoss;
    drawn += qDraw;
    loss += qLoss;
    immGrid += ((immW - solarW) * hours) / 1000;
    immSolar += (solarW * hours) / 1000;
    hpElec += (hpW * hours) / 1000;
    if (r.compressor || r.ts < lastCompressorMs + tailMs) hpHeat += qIn - qImm;
    else residual += qIn - qImm;
    addToSlots(r.ts, next.ts, hpW, immW - solarW, solarW);
  }

  let hpCost = 0,
    immCost = 0,
    forgone = 0,
    unpriced = 0;
  for (const [slot, e] of slotGrid) {
    const p = priceAt(tariffs, slot * HALF_HOUR_MS);
    if (!p) {
      unpriced += e.hp + e.imm;
      continue;
    }
    hpCost += e.hp * p.importPence;
    immCost += e.imm * p.importPence;
    forgone += e.solar * p.exportPence;
  }

  const heatIn = hpHeat + immGrid + immSolar;
  return {
    date: options.date,
    startMs,
    endMs,
    heatPumpHeatKWh: hpHeat,
    immersionGridHeatKWh: immGrid,
    immersionSolarHeatKWh: immSolar,
    heatInKWh: heatIn,
    drawnKWh: drawn,
    drawnLitres40: drawn / kWhPerLitreAt40(coldC),
    standingLossKWh: loss,
    storedChangeKWh: firstE === null ? 0 : lastE - firstE,
    residualKWh: residual,
    heatPumpElectricityKWh: hpElec,
    immersionGridElectricityKWh: immGrid,
    immersionSolarElectricityKWh: immSolar,
    heatPumpCostPence: hpCost,
    immersionCostPence: immCost,
    costPence: hpCost + immCost,
    solarExportForgonePence: forgone,
    unpricedKWh: unpriced,
    dhwCop: hpElec > 0 ? hpHeat / hpElec : null,
    coveredMinutes: covered,
    gapMinutes: gap,
  };
}

/** One month of {@link DayEnergy} summed (same fields, kWh and pence), with the days it holds. */
export interface MonthEnergy extends Omit<DayEnergy, 'date' | 'startMs' | 'endMs'> {
  /** Calendar month, "YYYY-MM". */ month: string;
  /** Days accounted in the month. */ days: number;
}

const SUMMED = [
  'heatPumpHeatKWh',
  'immersionGridHeatKWh',
  'immersionSolarHeatKWh',
  'heatInKWh',
  'drawnKWh',
  'drawnLitres40',
  'standingLossKWh',
  'storedChangeKWh',
  'residualKWh',
  'heatPumpElectricityKWh',
  'immersionGridElectricityKWh',
  'immersionSolarElectricityKWh',
  'heatPumpCostPence',
  'immersionCostPence',
  'costPence',
  'solarExportForgonePence',
  'unpricedKWh',
  'coveredMinutes',
  'gapMinutes',
] as const;

/** Sum days into calendar months (by each day's local date), oldest first; the month's DHW COP is its heat-pump heat over its heat-pump electricity. */
export function rollUpMonths(days: readonly DayEnergy[]): MonthEnergy[] {
  const months = new Map<string, MonthEnergy>();
  for (const d of days) {
    const key = d.date.slice(0, 7);
    let m = months.get(key);
    if (!m) {
      m = { month: key, days: 0, dhwCop: null } as MonthEnergy;
      for (const f of SUMMED) m[f] = 0;
      months.set(key, m);
    }
    m.days++;
    for (const f of SUMMED) m[f] += d[f];
  }
  const out = [...months.values()].sort((a, b) => a.month.localeCompare(b.month));
  for (const m of out) m.dhwCop = m.heatPumpElectricityKWh > 0 ? m.heatPumpHeatKWh / m.heatPumpElectricityKWh : null;
  return out;
}
