// An accelerated fleet for the alert tests: demo tanks (the simulator's own tank, controller and
// faults) stepped minute by minute on a simulated clock, their readings written through the real
// ingest writer into the test PostgreSQL, the alert rules run on each batch as the ingest worker
// runs them, and the alert clock turned on simulated time.
import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import { closeDb, getPool } from '../../../src/db';
import { demoTanks, type DemoTank, type FaultKind } from '../../../src/lib/demo/scenario';
import { TelemetryWriter, type IngestItem } from '../../../src/lib/telemetry/writer.server';
import { evaluateTanks, runClock } from '../../../src/lib/alerts/runner.server';
import { SimTank } from '../../../simulator/sim-tank';
import { query } from '../../support/db';
import { mailTo } from '../../support/mail';
import type { AlertKind } from '../../../src/lib/alerts/types';

export const MIN = 60_000;
export const HOUR = 60 * MIN;
export const DAY = 24 * HOUR;

/** Demo tanks by index within Kestrel Vale (the scenario is deterministic). */
const demo = (i: number): DemoTank => demoTanks().filter((t) => t.companySlug === 'kestrel-vale')[i]!;

/**
 * Healthy tanks for these tests: demo tanks set to store at 60 °C, as HSE HSG274 Part 2 (2014) asks
 * (a healthy tank kept at 50 °C is, by that guidance, a legionella risk, so it cannot serve as a
 * tank that should raise nothing). Air-source with plate and coil, and immersion-only.
 */
const HEALTHY = [3, 18, 27, 15] as const;

export interface SimTankRow {
  id: string;
  serial: string;
  homeId: string;
  sim: SimTank;
  demo: DemoTank;
  offlineWindows: boolean;
}
export interface AlertCompany {
  id: string;
  slug: string;
  name: string;
  operator: { id: string; email: string };
  householder: { id: string; email: string };
}

async function user(email: string, name: string): Promise<string> {
  const [u] = await query<{ id: string }>(
    `insert into "user" (id, email, name, password_hash, "emailVerified") values ($1, $2, $3, $4, now()) returning id`,
    [randomUUID(), email, name, await hash('alerts-test-password')],
  );
  return u!.id;
}

/** A company of its own per test file: its operator's mail and its daily digest are the test's alone. */
export async function createCompany(): Promise<AlertCompany> {
  const tag = randomUUID().slice(0, 8);
  const slug = `alerts-${tag}`;
  const name = `Brackenfold Heating ${tag}`;
  const [c] = await query<{ id: string }>(
    `insert into companies (slug, name, email_domain) values ($1, $2, 'brackenfold.example.com') returning id`,
    [slug, name],
  );
  const operator = {
    id: await user(`operator-${tag}@brackenfold.example.com`, 'Test operator'),
    email: `operator-${tag}@brackenfold.example.com`,
  };
  const householder = {
    id: await user(`home-${tag}@brackenfold.example.com`, 'Test householder'),
    email: `home-${tag}@brackenfold.example.com`,
  };
  await query(
    `insert into memberships (user_id, company_id, role) values ($1, $2, 'operator'), ($3, $2, 'householder')`,
    [operator.id, c!.id, householder.id],
  );
  return { id: c!.id, slug, name, operator, householder };
}

/** Adds demo tank `index` to the company as a new install (new serial), with `faults` injected; the householder lives at the first. */
export async function addTank(
  company: AlertCompany,
  index: number,
  faults: FaultKind[] = [],
  opts: { householder?: boolean } = {},
): Promise<SimTankRow> {
  const d = demo(index);
  const healthy = (HEALTHY as readonly number[]).includes(index);
  const spec: DemoTank = { ...d, faults: [], targetC: healthy ? 60 : d.targetC };
  const serial = `BF${randomUUID().slice(0, 6).toUpperCase()}-${index}`;
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants, has_solar) values ($1, $2, $3, $4, 'WM9 1AA', $5, $6) returning id`,
    [company.id, `${serial}-H`, `${index + 1} Fold Lane`, index % 2 ? 'Larkholt' : 'Cobbmere', d.occupants, d.hasSolar],
  );
  const [tank] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, declared_loss_w, target_c, hysteresis_k, commissioned_at)
     values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, now() - interval '60 days') returning id`,
    [
      company.id,
      home!.id,
      serial,
      d.model,
      d.volumeL,
      d.heightM,
      d.sensorCount,
      d.heatSource,
      d.hpOutputW,
      d.immersionW,
      d.declaredLossW,
      spec.targetC,
      d.hysteresisK,
    ],
  );
  if (opts.householder)
    await query('insert into home_members (home_id, user_id) values ($1, $2)', [home!.id, company.householder.id]);
  return {
    id: tank!.id,
    serial,
    homeId: home!.id,
    sim: new SimTank(spec, faults),
    demo: spec,
    offlineWindows: faults.includes('network_outage'),
  };
}

/** Clears a tank's injected faults (and puts back the set-point a low_setpoint fault lowered). */
export function clearFaults(t: SimTankRow): void {
  t.sim.faults.clear();
  t.sim.targetC = t.demo.targetC;
}

/** The simulator's network_outage windows (simulator/fleet.ts): 02:00–02:30 and 14:00–14:30. */
const inOutage = (ts: number) => {
  const m = Math.floor((ts % DAY) / MIN);
  return (m >= 120 && m < 150) || (m >= 840 && m < 870);
};

export class AcceleratedFleet {
  readonly writer = new TelemetryWriter(getPool());
  private held = new Map<string, IngestItem[]>();
  private pending: IngestItem[] = [];
  now: number;

  constructor(
    readonly company: AlertCompany,
    readonly tanks: SimTankRow[],
    start: number,
    readonly o = { batchMin: 30, clockMin: 10 },
  ) {
    this.now = start;
  }

  /**
   * Advances the simulated clock minute by minute until `until` (epoch ms) or until `stop()` says
   * so (checked after each clock turn); returns the simulated time reached.
   */
  async run(until: number, stop?: () => Promise<boolean>): Promise<number> {
    while (this.now < until) {
      const t = this.now;
      for (const tank of this.tanks) {
        const item: IngestItem = {
          tank: {
            id: tank.id,
            serial: tank.serial,
            companyId: this.company.id,
            sensorCount: tank.demo.sensorCount,
            volumeL: tank.demo.volumeL,
            targetC: tank.sim.targetC,
          },
          reading: tank.sim.step(t),
        };
        // A tank off the network keeps its readings and sends them as a backlog when it is back.
        if (tank.offlineWindows && tank.sim.faults.has('network_outage') && inOutage(t)) {
          this.held.set(tank.id, [...(this.held.get(tank.id) ?? []), item]);
          continue;
        }
        const backlog = this.held.get(tank.id);
        if (backlog) {
          this.pending.push(...backlog);
          this.held.delete(tank.id);
        }
        this.pending.push(item);
      }
      this.now += MIN;
      const minute = Math.round(this.now / MIN);
      if (minute % this.o.batchMin === 0) await this.flush();
      if (minute % this.o.clockMin === 0) {
        await this.flush();
        await runClock(this.now, { companyId: this.company.id, log: () => undefined });
        if (stop && (await stop())) break;
      }
    }
    await this.flush();
    return this.now;
  }

  /** Writes what is pending through the ingest writer, then runs the rules on those tanks (the worker's hook). */
  async flush(): Promise<void> {
    if (this.pending.length === 0) return;
    const batch = this.pending;
    this.pending = [];
    await this.writer.write({ readings: batch });
    await evaluateTanks(new Set(batch.map((i) => i.tank.id)));
  }
}

export interface StoredAlert {
  id: string;
  tank_id: string;
  kind: AlertKind;
  severity: string;
  state: string;
  evidence: any;
  opened_at: Date;
  resolved_at: Date | null;
}

export const alertsOf = (tankIds: string[]) =>
  query<StoredAlert>(
    `select id, tank_id, kind, severity, state, evidence, opened_at, resolved_at from alerts where tank_id = any($1::uuid[]) order by opened_at`,
    [tankIds],
  );

export async function openKinds(tankId: string): Promise<AlertKind[]> {
  return (
    await query<{ kind: AlertKind }>(
      `select kind from alerts where tank_id = $1 and state <> 'resolved' order by kind`,
      [tankId],
    )
  ).map((r) => r.kind);
}

/** Mail to `address` whose subject matches, waiting a little for the fake server to write it. */
export async function mailMatching(address: string, subject: RegExp, timeoutMs = 10_000) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const found = mailTo(address).filter((m) => subject.test(m.subject));
    if (found.length > 0 || Date.now() > until) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
}

export async function dropCompany(c: AlertCompany | undefined): Promise<void> {
  if (c) {
    const tanks = await query<{ id: string }>('select id from tanks where company_id = $1', [c.id]);
    await query('delete from readings where tank_id = any($1::uuid[])', [tanks.map((t) => t.id)]);
    await query('delete from companies where id = $1', [c.id]);
    await query('delete from "user" where id = any($1)', [[c.operator.id, c.householder.id]]);
  }
  await closeDb();
}

/** Start of a simulated run: midnight UTC `daysAgo` days before now (inside the readings' partitions). */
export const startDaysAgo = (daysAgo: number) => Math.floor((Date.now() - daysAgo * DAY) / DAY) * DAY;
