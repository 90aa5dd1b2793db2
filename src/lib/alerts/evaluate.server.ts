// Evaluating a tank's new readings and the clock inside one transaction per tank: rule state,
// alert rows and the point evaluated commit together, so each reading is judged once. The rows
// come from src/db/queries/alert-evaluation.ts; the rules are the engine's.
import { db, type Tx } from '../../db';
import { thresholdsFor } from '../../db/queries/alerts';
import {
  lockAlertTank,
  openAlert,
  openAlertKinds,
  resolveOpenAlert,
  saveAlertState,
  storedReadingsAfter,
  type AlertTankRow,
} from '../../db/queries/alert-evaluation';
import { readingOfRow } from '../telemetry/writer.server';
import type { Reading } from '../telemetry/wire';
import { evaluateClock, evaluateReadings, type EngineState, type TankFacts, type Transition } from './engine';
import type { Thresholds } from './thresholds';
import type { AlertKind } from './types';

const DAY = 86_400_000;
/** A tank the rules have never seen is evaluated from this far back at most (the longest rule window and a day). */
const FIRST_LOOKBACK_MS = 8 * DAY;
/** Readings read per round trip. */
const CHUNK = 5000;

const factsOf = (r: AlertTankRow): TankFacts => ({
  volumeL: r.volume_l,
  sensorCount: r.sensor_count,
  heatSource: r.heat_source,
  declaredLossW: r.declared_loss_w,
  occupants: r.occupants ?? 2,
  heightM: r.height_m,
  sensorHeightsM: r.sensor_heights_m,
  targetC: r.target_c,
  coldInletC: r.cold_inlet_c,
});

export interface AppliedTransition {
  alertId: string;
  tankId: string;
  companyId: string;
  kind: AlertKind;
  type: Transition['type'];
  at: number;
}

async function applyTransitions(
  tx: Tx,
  tank: AlertTankRow,
  th: Thresholds,
  transitions: readonly Transition[],
): Promise<AppliedTransition[]> {
  const out: AppliedTransition[] = [];
  const base = { tankId: tank.id, companyId: tank.company_id };
  for (const t of transitions) {
    if (t.type === 'open') {
      const id = await openAlert(
        tx,
        { id: tank.id, companyId: tank.company_id },
        t.kind,
        th.severity[t.kind],
        t.evidence,
        t.at,
      );
      if (id) out.push({ ...base, alertId: id, kind: t.kind, type: 'open', at: t.at });
    } else {
      for (const id of await resolveOpenAlert(tx, tank.id, t.kind, t.at))
        out.push({ ...base, alertId: id, kind: t.kind, type: 'resolve', at: t.at });
    }
  }
  return out;
}

/**
 * Runs the rules over the readings of `tankId` stored since it was last evaluated (each reading
 * once: a replayed batch finds nothing new). Returns the alerts it opened or resolved.
 */
export async function evaluateTankReadings(tankId: string): Promise<AppliedTransition[]> {
  return db().transaction(async (tx) => {
    const tank = await lockAlertTank(tx, tankId);
    if (!tank) return [];
    const th = await thresholdsFor(tank.company_id);
    const open = await openAlertKinds(tx, tankId);
    let state = tank.state as EngineState | null;
    const from =
      tank.evaluated_ms !== null
        ? Number(tank.evaluated_ms)
        : tank.latest_ms !== null
          ? Number(tank.latest_ms) - FIRST_LOOKBACK_MS
          : null;
    if (from === null) return [];
    let after = from;
    const applied: AppliedTransition[] = [];
    for (;;) {
      const readings: Reading[] = (await storedReadingsAfter(tx, tankId, after, CHUNK)).map((x) =>
        readingOfRow(tankId, x),
      );
      if (readings.length === 0) break;
      const res = evaluateReadings(state, readings, factsOf(tank), th, open);
      state = res.state;
      for (const a of await applyTransitions(tx, tank, th, res.transitions)) {
        applied.push(a);
        if (a.type === 'open') open.add(a.kind);
        else open.delete(a.kind);
      }
      after = readings[readings.length - 1]!.ts;
      if (readings.length < CHUNK) break;
    }
    if (state) await saveAlertState(tx, tankId, state);
    return applied;
  });
}

/**
 * Runs the time-based rules of one tank at `now` (epoch ms), or at the time `now()` gives once the
 * tank's row is read, so that everything received before that counts as heard.
 */
export async function evaluateTankClock(tankId: string, at: number | (() => number)): Promise<AppliedTransition[]> {
  return db().transaction(async (tx) => {
    const tank = await lockAlertTank(tx, tankId);
    if (!tank) return [];
    const now = typeof at === 'function' ? at() : at;
    const th = await thresholdsFor(tank.company_id);
    const open = await openAlertKinds(tx, tankId);
    // Offline means nothing heard: a tank replaying its backlog (old readings, received now) is online.
    // Receipt times later than `now` (a clock run on simulated past time) are no evidence either way.
    const heard = [tank.latest_ms, tank.seen_ms]
      .filter((v): v is string => v !== null)
      .map(Number)
      .filter((ms) => ms <= now);
    const res = evaluateClock(
      tank.state as EngineState | null,
      now,
      factsOf(tank),
      th,
      open,
      heard.length ? Math.max(...heard) : null,
    );
    const applied = await applyTransitions(tx, tank, th, res.transitions);
    await saveAlertState(tx, tankId, res.state);
    return applied;
  });
}
