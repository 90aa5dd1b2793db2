// One simulated cylinder: the thermal-core tank model, its controller, its household and its
// injected faults. step() advances one minute and returns what the tank's controller would report.
// The figures here (weather, cold-water season, solar surplus, heat-pump behaviour) are demo
// values chosen to look like real installs; they are never check values.
import type { DemoTank, FaultKind } from '../src/lib/demo/scenario';
import { seededRandom } from '../src/lib/demo/random';
import {
  createTank,
  estimatedCop,
  sensorReadings,
  stepTankInPlace,
  tankFigures,
  type TankSpec,
  type TankState,
} from '../src/lib/thermal';
import type { CommandRequest, Reading } from '../src/lib/telemetry/wire';
import { capabilities, hasMainSource } from '../src/lib/heat-sources';
import { localMinuteOfDay, solarDiversion, type Diversion } from '../src/lib/energy';
import { HOME_TIME_ZONE } from '../src/lib/tank-energy/contracts';
import { drawsForDay, type PlannedDraw } from './household';

const MIN = 60_000;
const DAY = 86_400_000;
/** At most one hot-water compressor start an hour (common practice). */
const MIN_START_GAP_MS = 60 * MIN;
/**
 * Legionella pasteurisation: store water at 60 °C or above (HSE HSG274 Part 2). Heat-pump
 * controllers that keep a lower everyday target run a periodic cycle instead; ours heats until the
 * control sensor reads PASTEUR_C and holds it for PASTEUR_HOLD_MS. Twice a week (Sunday and
 * Wednesday from 01:00 UTC), so that every 7-day window holds at least one complete cycle.
 */
const PASTEUR_C = 61;
const PASTEUR_HOLD_MS = 70 * MIN;
const PASTEUR_WEEKDAYS = new Set([0, 3]);
/**
 * A schedule's comfort floor (litres at 40 °C): outside the windows the controller heats anyway once
 * the tank holds less than the floor plus the first margin, until it holds the floor plus the second
 * (demo controller values: the first is about a long shower, so that a draw larger than the plan
 * expected does not take the store below the floor).
 */
export const COMFORT_START_MARGIN_L = 60;
const COMFORT_STOP_MARGIN_L = 110;
/** In a plan's charge window the heat pump stops once the sensor near the bottom is this close to the target, and starts again at twice it (demo). */
const CHARGE_DEADBAND_K = 2;

/** Why a heat source is on in a step: what the tests check a plan's schedule against. */
export type HeatReason = 'schedule' | 'boost' | 'pasteurisation' | 'comfort' | 'space_heating' | 'solar' | 'fault';

/** Outdoor air, °C: seasonal and daily swing (demo). */
function outdoorC(t: number): number {
  const doy = (t % (365.25 * DAY)) / DAY;
  const hour = (t % DAY) / 3_600_000;
  return 10 - 7 * Math.cos((2 * Math.PI * (doy - 20)) / 365.25) + 4 * Math.sin((2 * Math.PI * (hour - 9)) / 24);
}

/** Mains cold water, °C: lags the seasons (demo). */
function coldWaterC(t: number): number {
  const doy = (t % (365.25 * DAY)) / DAY;
  return 10 - 4 * Math.cos((2 * Math.PI * (doy - 45)) / 365.25);
}

const inWindow = (minuteOfDay: number, from: string, to: string) => {
  const f = Number(from.slice(0, 2)) * 60 + Number(from.slice(3));
  const e = Number(to.slice(0, 2)) * 60 + Number(to.slice(3));
  return f <= e ? minuteOfDay >= f && minuteOfDay < e : minuteOfDay >= f || minuteOfDay < e;
};

export interface SimTankSnapshot {
  nodesC: number[];
  hpOn: boolean;
  lastStart: number;
  tripUntil: number;
  boostUntil: number;
  targetC: number;
  hysteresisK: number;
  windows: { from: string; to: string }[];
  comfortFloorL40?: number | null;
  seq: number;
  stuckC: number | null;
  pasteurDay?: number;
  pasteurHoldUntil?: number;
}

export class SimTank {
  readonly spec: TankSpec;
  readonly faults: Set<FaultKind>;
  private state: TankState;
  private hpOn = false;
  private immersionTopUp = false;
  private lastStart = -Infinity;
  private runStart = 0;
  /** short_cycle: a high-pressure trip holds the compressor off until then. */
  private tripUntil = 0;
  private boostUntil = 0;
  targetC: number;
  hysteresisK: number;
  windows: { from: string; to: string }[] = [];
  /** Litres at 40 °C the schedule keeps at least (from a charge plan), or null. */
  comfortFloorL40: number | null = null;
  private comfortOn = false;
  /** Why each source ran in the last step (null: off). */
  lastHeat: { heatPump: HeatReason | null; immersion: HeatReason | null } = { heatPump: null, immersion: null };
  private seq = 0;
  private stuckC: number | null = null;
  /** The day (days since the epoch) of the last pasteurisation cycle started, and its hold's end. */
  private pasteurDay = -1;
  private pasteurHoldUntil = 0;
  private pasteurising = false;
  private drawDay = -1;
  private plan: PlannedDraw[] = [];
  private active: { remainingJ: number; flowLpm: number; mixC: number; until: number } | null = null;
  private readonly rand: () => number;
  /** What the diverter did in the last step (for tests and the curious). */
  lastDiversion: Diversion['reason'] | 'element_busy' = 'no_surplus';

  constructor(
    readonly demo: DemoTank,
    faults: readonly FaultKind[] = demo.faults,
  ) {
    this.faults = new Set(faults);
    this.spec = {
      volumeL: demo.volumeL,
      sensorCount: demo.sensorCount,
      heightM: demo.heightM,
      ambientC: 18,
      // Declared standing loss is measured with the store 45 K above the room (EN 12897, from memory): UA = S / 45 K.
      uaWPerK: demo.declaredLossW / 45,
      heatSource: demo.heatSource,
      hpOutputW: demo.hpOutputW,
      immersionW: demo.immersionW,
      immersionHeightFrac: capabilities(demo.heatSource).immersion === 'only' ? 0.15 : 0.55,
      maxFlowC: 65,
    };
    this.targetC = this.faults.has('low_setpoint') ? 45 : demo.targetC;
    this.hysteresisK = demo.hysteresisK;
    this.state = createTank(this.spec, this.targetC - 8);
    this.rand = seededRandom(
      demo.serial.split('').reduce((h, c) => Math.imul(h ^ c.charCodeAt(0), 16777619), 2166136261) >>> 0,
    );
  }

  snapshot(): SimTankSnapshot {
    return {
      nodesC: [...this.state.nodesC],
      hpOn: this.hpOn,
      lastStart: this.lastStart,
      tripUntil: this.tripUntil,
      boostUntil: this.boostUntil,
      targetC: this.targetC,
      hysteresisK: this.hysteresisK,
      windows: this.windows,
      comfortFloorL40: this.comfortFloorL40,
      seq: this.seq,
      stuckC: this.stuckC,
      pasteurDay: this.pasteurDay,
      pasteurHoldUntil: this.pasteurHoldUntil,
    };
  }

  restore(s: SimTankSnapshot): void {
    if (s.nodesC.length === this.state.nodesC.length) this.state = { nodesC: [...s.nodesC] };
    Object.assign(this, {
      hpOn: s.hpOn,
      lastStart: s.lastStart ?? -Infinity,
      tripUntil: s.tripUntil,
      boostUntil: s.boostUntil,
      targetC: s.targetC,
      hysteresisK: s.hysteresisK,
      windows: s.windows,
      seq: s.seq,
      stuckC: s.stuckC,
    });
    this.comfortFloorL40 = s.comfortFloorL40 ?? null;
    this.pasteurDay = s.pasteurDay ?? -1;
    this.pasteurHoldUntil = s.pasteurHoldUntil ?? 0;
    this.pasteurising = this.pasteurHoldUntil > 0;
  }

  /** Obeys a command; returns a reason when it cannot. */
  apply(cmd: CommandRequest, now: number): string | null {
    if (cmd.kind === 'boost') this.boostUntil = now + cmd.minutes * MIN;
    else if (cmd.kind === 'set_target') {
      this.targetC = cmd.targetC;
      if (cmd.hysteresisK) this.hysteresisK = cmd.hysteresisK;
    } else {
      this.windows = cmd.windows;
      this.comfortFloorL40 = cmd.comfortFloorL40 ?? null;
    }
    return null;
  }

  /**
   * The pasteurisation phase at `t`: 'heat' (bring the store up to PASTEUR_C), 'hold', or null.
   * A tank with the low_setpoint fault has the cycle switched off, like a misconfigured install.
   */
  private pasteurisation(t: number, controlC: number): 'heat' | 'hold' | null {
    if (this.faults.has('low_setpoint')) return null;
    const day = Math.floor(t / DAY);
    const weekday = (day + 4) % 7; // 1970-01-01 was a Thursday; 0 is Sunday
    if (!this.pasteurising && PASTEUR_WEEKDAYS.has(weekday) && this.pasteurDay !== day && t % DAY >= 60 * MIN) {
      this.pasteurising = true;
      this.pasteurDay = day;
      this.pasteurHoldUntil = 0;
    }
    if (!this.pasteurising) return null;
    if (this.pasteurHoldUntil === 0) {
      if (controlC < PASTEUR_C) return 'heat';
      this.pasteurHoldUntil = t + PASTEUR_HOLD_MS;
    }
    if (t < this.pasteurHoldUntil) return 'hold';
    this.pasteurising = false;
    this.pasteurHoldUntil = 0;
    return null;
  }

  /**
   * Solar power beyond the household's own use, W (demo): a midday bump, about 2.5 kW at its peak in
   * midsummer and 0.5 kW in midwinter over a shorter day, varying minute to minute with the clouds.
   */
  private solarSurplusW(t: number): number {
    const doy = (t % (365.25 * DAY)) / DAY;
    const summer = 0.5 + 0.5 * Math.cos((2 * Math.PI * (doy - 172)) / 365.25); // 1 at the June solstice, 0 at December's
    const halfDayH = 3 + 2 * summer;
    const fromNoonH = (t % DAY) / 3_600_000 - 12;
    if (Math.abs(fromNoonH) >= halfDayH) return 0;
    return (500 + 2000 * summer) * Math.cos((Math.PI * fromNoonH) / (2 * halfDayH)) * (0.4 + 0.6 * this.rand());
  }

  /**
   * Whether the comfort floor calls for heat outside the schedule's windows now: on below the floor
   * plus COMFORT_START_MARGIN_L, off again at the floor plus COMFORT_STOP_MARGIN_L.
   */
  private comfortCall(sensors: readonly number[], scheduled: boolean): boolean {
    if (this.windows.length === 0 || this.comfortFloorL40 === null || scheduled) return (this.comfortOn = false);
    // The controller judges its store as the platform does (the thermal core's figures, EN 16147's 10 °C and 40 °C).
    const { volumeL, heightM, sensorCount } = this.spec;
    const v40 = tankFigures({ layersC: sensors }, { volumeL, heightM, sensorCount, targetC: this.targetC }).v40L ?? 0;
    if (!this.comfortOn && v40 < this.comfortFloorL40 + COMFORT_START_MARGIN_L) this.comfortOn = true;
    else if (this.comfortOn && v40 >= this.comfortFloorL40 + COMFORT_STOP_MARGIN_L) this.comfortOn = false;
    return this.comfortOn;
  }

  get boosting(): boolean {
    return this.boostUntil > 0;
  }

  /** Whether the comfort floor called for heat in the last step (it may wait for the heat pump's start gap, or the element may answer it). */
  get comfortCalling(): boolean {
    return this.comfortOn;
  }

  /** One minute ending at `t` (epoch ms): controller, household draw, physics, then the reading. */
  step(t: number): Reading {
    const dtS = 60;
    const sensors = sensorReadings(this.spec, this.state);
    const n = sensors.length;
    const controlC = sensors[Math.floor(n * 0.4)];
    const topC = sensors[n - 1];
    const minuteOfDay = Math.floor((t % DAY) / MIN);
    const winter = outdoorC(t) < 12;
    // In the heating season the heat pump serves the house first at the morning and evening peaks.
    const spaceHeatingBusy =
      winter && (inWindow(minuteOfDay, '06:00', '08:00') || inWindow(minuteOfDay, '17:00', '20:00'));
    const boost = this.boostUntil > t;
    if (!boost && this.boostUntil > 0 && this.boostUntil <= t) this.boostUntil = 0;
    // Schedule windows are wall-clock times at the home (they move with British Summer Time).
    const homeMinute = this.windows.length === 0 ? minuteOfDay : localMinuteOfDay(t, HOME_TIME_ZONE);
    const scheduled = this.windows.length === 0 || this.windows.some((w) => inWindow(homeMinute, w.from, w.to));
    const hasHp = hasMainSource(this.spec.heatSource) && this.spec.hpOutputW > 0; // heat pump or boiler
    const pasteur = this.pasteurisation(t, controlC);
    const comfort = this.comfortCall(sensors, scheduled);

    // Heat pump (or boiler) thermostat with hysteresis and the one-start-an-hour rule. It may heat
    // inside the schedule's windows (and stops when one closes), or outside them for a boost, the
    // pasteurisation cycle or the comfort floor. A plan's windows (a schedule with a comfort floor)
    // are charge windows: in them it heats the whole store, until the sensor near the bottom reaches
    // the target, as the charge planner's model assumes.
    if (hasHp) {
      const shortCycle = this.faults.has('short_cycle');
      const charging = scheduled && this.windows.length > 0 && this.comfortFloorL40 !== null;
      const chargeC = sensors[Math.floor(n * 0.15)];
      if (this.hpOn) {
        const tripped = shortCycle && t - this.runStart >= (4 + Math.floor(this.rand() * 3)) * MIN;
        if (tripped) this.tripUntil = t + 6 * MIN;
        const satisfied =
          pasteur === 'heat'
            ? controlC >= PASTEUR_C
            : charging
              ? chargeC >= this.targetC - CHARGE_DEADBAND_K
              : controlC >= this.targetC;
        const allowed = scheduled || boost || pasteur === 'heat' || comfort;
        // A boost or the comfort floor takes the heat pump back from the house (hot-water priority).
        if (satisfied || tripped || (spaceHeatingBusy && !boost && !comfort) || pasteur === 'hold' || !allowed)
          this.hpOn = false;
      } else {
        const wants =
          controlC < this.targetC - this.hysteresisK ||
          ((boost || comfort) && controlC < this.targetC) ||
          (charging && chargeC < this.targetC - 2 * CHARGE_DEADBAND_K) ||
          pasteur === 'heat';
        const mayStart = shortCycle ? t >= this.tripUntil : t - this.lastStart >= MIN_START_GAP_MS;
        if (
          wants &&
          mayStart &&
          (scheduled || boost || pasteur === 'heat' || comfort) &&
          (!spaceHeatingBusy || comfort)
        ) {
          this.hpOn = true;
          this.lastStart = t;
          this.runStart = t;
        }
      }
    }

    // Immersion: the only source of an immersion-only tank; otherwise a top-up while the heat
    // pump is busy with the house, a boost when no heat pump can take it, solar surplus, or a fault.
    let immersionOn = false;
    let immersionWhy: HeatReason | null = null;
    if (this.faults.has('immersion_stuck')) [immersionOn, immersionWhy] = [true, 'fault'];
    else if (!hasHp) {
      if (this.immersionTopUp ? controlC >= this.targetC : controlC < this.targetC - this.hysteresisK)
        this.immersionTopUp = !this.immersionTopUp;
      if (this.immersionTopUp && scheduled) [immersionOn, immersionWhy] = [true, 'schedule'];
      else if (comfort) [immersionOn, immersionWhy] = [true, 'comfort'];
    } else {
      if (spaceHeatingBusy && topC < 42) this.immersionTopUp = true;
      if (this.immersionTopUp && (topC >= 48 || !spaceHeatingBusy)) this.immersionTopUp = false;
      if (this.immersionTopUp) [immersionOn, immersionWhy] = [true, 'space_heating'];
      // The element backs the heat pump up on the comfort floor while the heat pump cannot run.
      else if (comfort && !this.hpOn) [immersionOn, immersionWhy] = [true, 'comfort'];
    }
    // A boost switches the element on (its own thermostat still caps it) as well as the heat pump;
    // so does a pasteurisation cycle, and during its hold the element keeps the store at PASTEUR_C.
    if (boost) [immersionOn, immersionWhy] = [true, 'boost'];
    else if (pasteur === 'heat' || (pasteur === 'hold' && controlC < PASTEUR_C))
      [immersionOn, immersionWhy] = [true, 'pasteurisation'];
    // Solar surplus goes to the element through a proportional diverter, only while the water it can
    // reach has room below its thermostat (the energy core's rule); a full tank exports instead.
    const surplusW = this.demo.hasSolar ? this.solarSurplusW(t) : 0;
    let immersionPowerW: number | undefined;
    if (!immersionOn && surplusW > 0) {
      const d = solarDiversion({
        exportW: surplusW,
        divertingW: 0,
        immersionW: this.spec.immersionW,
        layersC: sensors,
        volumeL: this.spec.volumeL,
        immersionHeightFrac: this.spec.immersionHeightFrac,
      });
      this.lastDiversion = d.reason;
      if (d.divertW > 0) {
        [immersionOn, immersionWhy] = [true, 'solar'];
        immersionPowerW = d.divertW;
      }
    } else this.lastDiversion = surplusW > 0 ? 'element_busy' : 'no_surplus';

    // Household draw.
    const day = Math.floor(t / DAY);
    if (day !== this.drawDay) {
      this.drawDay = day;
      this.plan = drawsForDay(this.demo.serial, this.demo.occupants, day * DAY);
    }
    while (this.plan.length > 0 && this.plan[0].at <= t) {
      const d = this.plan.shift()!;
      if (!this.active)
        this.active = { remainingJ: d.energyKWh * 3.6e6, flowLpm: d.flowLpm, mixC: d.mixC, until: t + 30 * MIN };
    }
    const coldC = coldWaterC(t);
    let drawLpm = 0;
    if (this.active) {
      const span = Math.max(1, topC - coldC);
      const hotFraction = Math.min(1, Math.max(0, (this.active.mixC - coldC) / span));
      const needLitres = this.active.remainingJ / (4180 * span);
      drawLpm = Math.min(this.active.flowLpm * hotFraction, needLitres);
    }

    const flowC = pasteur === 'heat' ? 65 : Math.min(65, this.targetC + 5);
    this.lastHeat = {
      heatPump: !this.hpOn
        ? null
        : pasteur === 'heat'
          ? 'pasteurisation'
          : boost
            ? 'boost'
            : scheduled
              ? 'schedule'
              : 'comfort',
      immersion: immersionWhy,
    };
    const out = stepTankInPlace(this.spec, this.state, {
      dtS,
      coldC,
      drawLpm,
      hpOn: this.hpOn,
      immersionOn,
      hpFlowC: flowC,
      ...(immersionPowerW === undefined ? {} : { immersionPowerW }),
    });
    if (this.active) {
      this.active.remainingJ -= out.drawnJ;
      if (this.active.remainingJ <= 1000 || t >= this.active.until) this.active = null;
    }

    // What the controller reports.
    const layers: (number | null)[] = sensorReadings(this.spec, this.state).map(
      (c) => Math.round((c + (this.rand() - 0.5) * 0.1) * 100) / 100,
    );
    if (this.faults.has('sensor_open')) layers[2] = null;
    if (this.faults.has('sensor_stuck')) {
      this.stuckC ??= layers[n - 3];
      layers[n - 3] = this.stuckC;
    }
    if (this.faults.has('sensors_swapped')) [layers[1], layers[n - 2]] = [layers[n - 2], layers[1]];
    const hpW = out.hpHeatJ / dtS;
    const cop = hpW > 0 ? estimatedCop({ sinkC: flowC, sourceC: outdoorC(t) }) : 1;
    const reading: Reading = {
      ts: t,
      layersC: layers,
      compressor: this.hpOn,
      immersionW: Math.round(out.immersionHeatJ / dtS),
      powerW: Math.round(hpW / cop + out.immersionHeatJ / dtS),
      drawLpm: Math.round(drawLpm * 10) / 10,
      seq: ++this.seq,
    };
    if (this.demo.hasSolar) reading.solarSurplusW = Math.round(surplusW);
    if (this.hpOn) {
      const bottom = layers[0] ?? sensors[0];
      reading.returnC = Math.round((bottom + 1) * 100) / 100;
      reading.flowC = Math.round(Math.min(flowC, bottom + 1 + hpW / (0.25 * 4180)) * 100) / 100;
      reading.pumpPct = 80;
    }
    return reading;
  }
}
