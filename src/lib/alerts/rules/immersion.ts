// Immersion doing too much: the immersion element's share of the heat put into the cylinder over
// the window (7 days) above the configured share (applies where a heat pump exists: applicability.ts). The heat of each
// source comes from the energy core's accountDay (an energy balance over the readings), one UTC day
// at a time, kept as daily sums so that each batch only adds to them. Heat from diverted solar surplus
// (readings' solarSurplusW) is free and displaces nothing the household pays for, so only the
// element's grid heat counts. Pure: no I/O.
import { accountDay } from '../../energy';
import type { Reading } from '../../telemetry/wire';
import type { Thresholds } from '../thresholds';
import { DAY, MAX_GAP_MS, clear, round1, unknown, type Finding } from './common';

/** Below this much heat in the window the share says nothing (a tank on holiday). Common practice. */
const MIN_HEAT_KWH = 3;
/** The share must fall this many points below the limit to clear: no flapping at the edge. */
const CLEAR_BAND_PCT = 5;

type Row = {
  ts: number;
  layersC: number[];
  compressor?: boolean;
  immersionW?: number;
  powerW?: number;
  drawLpm?: number;
  solarSurplusW?: number;
};
export interface ImmersionState {
  days: { day: number; hpKWh: number; immKWh: number; coveredMin: number }[];
  prev: Row | null;
}

export const initialImmersion = (): ImmersionState => ({ days: [], prev: null });

export interface AccountingSpec {
  volumeL: number;
  uaWPerK: number;
  ambientC: number;
}

/**
 * Adds a batch to the daily energy sums. `columns[i]`: reading i's layers from the tank's figures
 * (a doubted sensor estimated by height; null when withheld, so the reading is skipped).
 */
export function accountBatch(
  s: ImmersionState,
  readings: readonly Reading[],
  columns: readonly (readonly number[] | null)[],
  tank: AccountingSpec,
  th: Thresholds,
): void {
  const rows: Row[] = [];
  if (s.prev && readings.length > 0 && readings[0]!.ts - s.prev.ts <= MAX_GAP_MS) rows.push(s.prev);
  for (const [i, r] of readings.entries()) {
    const layers = columns[i];
    if (!layers) continue;
    const row: Row = { ts: r.ts, layersC: layers.map((t) => Math.min(100, Math.max(0, t))) };
    if (r.compressor !== undefined) row.compressor = r.compressor;
    if (r.immersionW !== undefined) row.immersionW = r.immersionW;
    if (r.powerW !== undefined) row.powerW = r.powerW;
    if (r.drawLpm !== undefined) row.drawLpm = r.drawLpm;
    if (r.solarSurplusW !== undefined) row.solarSurplusW = r.solarSurplusW;
    rows.push(row);
  }
  if (rows.length >= 2) {
    // One accountDay per UTC day the intervals start in.
    let i = 0;
    while (i + 1 < rows.length) {
      const day = Math.floor(rows[i]!.ts / DAY);
      let j = i;
      while (j + 1 < rows.length && Math.floor(rows[j]!.ts / DAY) === day) j++;
      const slice = rows.slice(i, j + 1);
      const e = accountDay(slice, tank, [], {
        startMs: slice[0]!.ts,
        endMs: Math.min(slice[slice.length - 1]!.ts, (day + 1) * DAY),
        date: new Date(day * DAY).toISOString().slice(0, 10),
      });
      let d = s.days.find((x) => x.day === day);
      if (!d) s.days.push((d = { day, hpKWh: 0, immKWh: 0, coveredMin: 0 }));
      d.hpKWh += Math.max(0, e.heatPumpHeatKWh);
      d.immKWh += e.immersionGridHeatKWh;
      d.coveredMin += e.coveredMinutes;
      i = j;
    }
  }
  if (rows.length > 0) s.prev = rows[rows.length - 1]!;
  const oldest = Math.floor((readings[readings.length - 1]?.ts ?? 0) / DAY) - th.immersionWindowDays;
  s.days = s.days.filter((d) => d.day >= oldest).sort((a, b) => a.day - b.day);
}

export function immersionFinding(s: ImmersionState, at: number, th: Thresholds): Finding {
  const from = at - th.immersionWindowDays * DAY;
  const days = s.days.filter((d) => (d.day + 1) * DAY > from);
  const hp = days.reduce((a, d) => a + d.hpKWh, 0);
  const imm = days.reduce((a, d) => a + d.immKWh, 0);
  const covered = days.reduce((a, d) => a + d.coveredMin, 0);
  if (covered < 24 * 60 || hp + imm < MIN_HEAT_KWH) return unknown;
  const sharePct = (100 * imm) / (hp + imm);
  if (sharePct <= th.immersionMaxShare - CLEAR_BAND_PCT) return clear;
  if (sharePct <= th.immersionMaxShare) return unknown;
  return {
    active: true,
    evidence: {
      summary: `The immersion heater gave ${Math.round(sharePct)}% of the heat over the last ${round1(covered / 1440)} days (${round1(imm)} kWh against ${round1(hp)} kWh from the heat pump); the limit is ${th.immersionMaxShare}%.`,
      facts: {
        immersionSharePct: round1(sharePct),
        immersionKWh: round1(imm),
        heatPumpKWh: round1(hp),
        coveredDays: round1(covered / 1440),
        limitPct: th.immersionMaxShare,
      },
      events: days.map((d) => ({
        kind: 'day',
        start: d.day * DAY,
        end: (d.day + 1) * DAY,
        detail: `immersion ${round1(d.immKWh)} kWh, heat pump ${round1(d.hpKWh)} kWh`,
      })),
      at: Math.max(from, (days[0]?.day ?? 0) * DAY),
    },
  };
}
