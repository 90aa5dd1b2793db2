// The alert engine: runs every rule over a tank's new readings (in time order, each reading once)
// and on the clock, and turns what the rules find into lifecycle transitions with hysteresis:
// a kind opens once its condition has held for its open delay, and resolves once it has been
// clear for its clear delay; in between nothing changes, so an alert never flaps. Everything a
// rule needs from the past travels in EngineState. Pure: no I/O, no clock of its own.
import type { Reading } from '../telemetry/wire';
import type { HeatSource } from '../heat-sources';
import { columnMeanC, tankFigures, type TankGeometry } from '../thermal';
import { ruleApplies } from './applicability';
import type { Thresholds } from './thresholds';
import { alertKinds, type AlertEvidence, type AlertKind } from './types';
import { MIN, type Finding } from './rules/common';
import { initialShortCycle, shortCycleFinding, stepShortCycle, type ShortCycleState } from './rules/short-cycling';
import { offlineFinding } from './rules/offline';
import { initialSensor, sensorFinding, sensorSuspect, stepSensor, type SensorState } from './rules/sensor-fault';
import { initialLegionella, legionellaFinding, stepLegionella, type LegionellaState } from './rules/legionella';
import {
  initialLowHotWater,
  learnFromBatch,
  lowHotWaterFinding,
  stepLowHotWater,
  type LowHotWaterState,
} from './rules/low-hot-water';
import { accountBatch, immersionFinding, initialImmersion, type ImmersionState } from './rules/immersion';
import { heatLossFinding, initialHeatLoss, stepHeatLoss, type HeatLossState } from './rules/heat-loss';

/** What the rules need to know about a tank. */
export interface TankFacts {
  volumeL: number;
  sensorCount: number;
  /** What heats it: decides which rules apply (`ruleApplies`). */
  heatSource: HeatSource;
  /** Declared standing loss, W (null: not known, so no heat-loss rule). */
  declaredLossW: number | null;
  occupants: number;
  /** Geometry for the tank's figures (thermal `tankFigures`); absent: evenly spaced sensors in a 1 m column, target 55 °C. */
  heightM?: number;
  sensorHeightsM?: readonly number[] | null;
  targetC?: number;
  coldInletC?: number | null;
}

/** The thermal core's geometry of a tank, so the rules' V40 is the figure every screen shows. */
const figureGeometryOf = (t: TankFacts): TankGeometry => ({
  volumeL: t.volumeL,
  heightM: t.heightM ?? 1,
  sensorCount: t.sensorCount,
  sensorHeightsM: t.sensorHeightsM ?? null,
  targetC: t.targetC ?? 55,
  coldInletC: t.coldInletC ?? null,
});

interface Track {
  activeSince: number | null;
  clearSince: number | null;
  open: boolean;
}

export interface EngineState {
  v: 1;
  /** Newest reading seen, epoch ms. */
  lastTs: number | null;
  tracks: Partial<Record<AlertKind, Track>>;
  shortCycle: ShortCycleState;
  sensor: SensorState;
  legionella: LegionellaState;
  lowHotWater: LowHotWaterState;
  immersion: ImmersionState;
  heatLoss: HeatLossState;
}

export type Transition =
  | { type: 'open'; kind: AlertKind; at: number; evidence: AlertEvidence }
  | { type: 'resolve'; kind: AlertKind; at: number };

function initialState(sensorCount: number): EngineState {
  return {
    v: 1,
    lastTs: null,
    tracks: {},
    shortCycle: initialShortCycle(),
    sensor: initialSensor(sensorCount),
    legionella: initialLegionella(),
    lowHotWater: initialLowHotWater(),
    immersion: initialImmersion(),
    heatLoss: initialHeatLoss(),
  };
}

/** Minutes a condition must hold before it opens, and be clear before it resolves (the hysteresis). */
function delays(kind: AlertKind, th: Thresholds): { openMin: number; clearMin: number } {
  switch (kind) {
    case 'low_hot_water':
      return { openMin: th.lowHotWaterMin, clearMin: 60 };
    // A sensor can look right for a while (a swapped pair reads true when the tank is mixed): wait long before trusting it again.
    case 'sensor_fault':
      return { openMin: 0, clearMin: 360 };
    case 'short_cycling':
      return { openMin: 0, clearMin: 30 };
    case 'offline':
      return { openMin: 0, clearMin: 10 };
    default:
      return { openMin: 0, clearMin: 0 };
  }
}

class Run {
  readonly transitions: Transition[] = [];
  constructor(
    readonly s: EngineState,
    readonly th: Thresholds,
    readonly heatSource: HeatSource,
    openKinds: ReadonlySet<AlertKind>,
  ) {
    // Align with what is stored: a person may have resolved an alert (start afresh), or one may be open that the state forgot.
    for (const kind of alertKinds) {
      const t = s.tracks[kind];
      if (t?.open && !openKinds.has(kind)) s.tracks[kind] = { activeSince: null, clearSince: null, open: false };
      else if (!t?.open && openKinds.has(kind))
        s.tracks[kind] = { activeSince: t?.activeSince ?? null, clearSince: null, open: true };
    }
  }

  apply(kind: AlertKind, finding: Finding, at: number): void {
    // A rule that does not apply to this heat source is clear (and so resolves one opened before the tank's source was corrected).
    const f: Finding = ruleApplies(kind, this.heatSource) ? finding : { active: false };
    if (f.active === null) return;
    const t = (this.s.tracks[kind] ??= { activeSince: null, clearSince: null, open: false });
    const { openMin, clearMin } = delays(kind, this.th);
    if (f.active) {
      t.clearSince = null;
      t.activeSince ??= Math.min(f.since ?? at, at);
      if (!t.open && at - t.activeSince >= openMin * MIN) {
        t.open = true;
        this.transitions.push({ type: 'open', kind, at: t.activeSince + openMin * MIN, evidence: f.evidence });
      }
    } else {
      t.activeSince = null;
      if (!t.open) return;
      t.clearSince ??= at;
      if (at - t.clearSince >= clearMin * MIN) {
        t.open = false;
        t.clearSince = null;
        this.transitions.push({ type: 'resolve', kind, at });
      }
    }
  }
}

/**
 * Runs the rules over `readings` (any order; those not newer than the state's last reading are
 * skipped, so a replayed batch changes nothing). `openKinds`: the kinds with an unresolved alert
 * stored for this tank. Returns the next state and the transitions. The state passed in is
 * advanced in place (it is freshly read for every evaluation; copying it each time cost more than
 * the rules themselves).
 */
export function evaluateReadings(
  state: EngineState | null,
  readings: readonly Reading[],
  tank: TankFacts,
  th: Thresholds,
  openKinds: ReadonlySet<AlertKind>,
): { state: EngineState; transitions: Transition[] } {
  const s: EngineState = state ?? initialState(tank.sensorCount);
  const run = new Run(s, th, tank.heatSource, openKinds);
  const fresh = readings.filter((r) => s.lastTs === null || r.ts > s.lastTs).sort((a, b) => a.ts - b.ts);
  if (fresh.length === 0) return { state: s, transitions: [] };

  // Each reading's figures once, from the thermal core (the sensors the stuck check holds stuck at
  // the start of the batch left out), for every rule that reads the column.
  const geometry = figureGeometryOf(tank);
  const stuck = s.sensor.stuck.flatMap((x, i) => (x === true ? [i] : []));
  const figures = fresh.map((r) => tankFigures(r, geometry, { stuck }));
  const columns = figures.map((f) => f.layersC);
  learnFromBatch(s.lowHotWater, fresh, columns, tank.occupants);
  for (const [i, r] of fresh.entries()) {
    const column = columns[i]!;
    stepShortCycle(s.shortCycle, r, th);
    stepSensor(s.sensor, r, th);
    const trusted = !sensorSuspect(s.sensor);
    stepLegionella(s.legionella, r, th);
    stepLowHotWater(s.lowHotWater, r, figures[i]!.v40L);
    stepHeatLoss(s.heatLoss, r, column && columnMeanC(column, geometry), tank.volumeL, tank.declaredLossW, th);
    run.apply('short_cycling', shortCycleFinding(s.shortCycle, r.ts, th), r.ts);
    run.apply('sensor_fault', sensorFinding(s.sensor, r.ts, th), r.ts);
    // Figures from a column the sensor checks doubt are not evidence either way.
    run.apply('legionella_risk', trusted ? legionellaFinding(s.legionella, r.ts, th) : { active: null }, r.ts);
    run.apply('low_hot_water', lowHotWaterFinding(s.lowHotWater, r.ts, th, tank.occupants, trusted), r.ts);
    s.lastTs = r.ts;
  }
  const last = fresh[fresh.length - 1]!.ts;
  accountBatch(
    s.immersion,
    fresh,
    columns,
    { volumeL: tank.volumeL, uaWPerK: (tank.declaredLossW ?? DEFAULT_LOSS_W) / 45, ambientC: th.heatLossAmbientC },
    th,
  );
  run.apply('immersion_heavy', immersionFinding(s.immersion, last, th), last);
  run.apply('heat_loss', heatLossFinding(s.heatLoss, th), last);
  // Readings are arriving, so the tank is not offline (the clock resolves it once they have kept coming).
  return { state: s, transitions: run.transitions };
}

/** Standing loss assumed when a tank has none declared, W at 45 K (the middle of class B/C tanks; common practice). */
const DEFAULT_LOSS_W = 60;

/**
 * The rules that move with time rather than readings, at `now` (epoch ms): offline, and the
 * legionella window running out on a tank that reports nothing new. Advances `state` in place.
 */
export function evaluateClock(
  state: EngineState | null,
  now: number,
  tank: TankFacts,
  th: Thresholds,
  openKinds: ReadonlySet<AlertKind>,
  lastReadingTs: number | null,
): { state: EngineState; transitions: Transition[] } {
  const s: EngineState = state ?? initialState(tank.sensorCount);
  const run = new Run(s, th, tank.heatSource, openKinds);
  const lastTs = Math.max(s.lastTs ?? -Infinity, lastReadingTs ?? -Infinity);
  run.apply('offline', offlineFinding(Number.isFinite(lastTs) ? lastTs : null, now, th), now);
  if (!sensorSuspect(s.sensor) && s.lastTs !== null && now > s.lastTs)
    run.apply('legionella_risk', legionellaFinding(s.legionella, now, th), now);
  return { state: s, transitions: run.transitions };
}
